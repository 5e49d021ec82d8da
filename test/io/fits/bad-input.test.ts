/**
 * Bad FITS input: every failure is an InputError that names the file, the HDU, the card
 * and the keyword where known, and says what is wrong; oddities that can be read past are
 * warnings. Messages are asserted in full.
 */
import { describe, expect, it } from 'vitest';
import { InputError, UsageError, type LineshiftError } from '../../../src/errors.js';
import { parseFitsSpectrum } from '../../../src/io/fits/spectrum.js';
import { parseSpectrum } from '../../../src/io/read.js';
import { collectingLogger } from '../../../src/logger.js';
import { buildFits, card, fixtureBytes, float32Bytes, float64Bytes, primary1d } from './helpers.js';

const FLUX = float32Bytes([1, 2, 3, 4, 5]);
const good = () => buildFits([{ cards: primary1d(5, [card('CRVAL1', '6000.0'), card('CDELT1', '1.0'), card('CRPIX1', '1.0'), card('CUNIT1', "'Angstrom'")]), data: FLUX }]);

function failure(bytes: Uint8Array, options = {}): LineshiftError {
  try {
    parseFitsSpectrum(bytes, 'bad.fits', options);
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return e as LineshiftError;
  }
  throw new Error('expected an InputError');
}

function expectFailure(bytes: Uint8Array, code: string, message: string, options = {}): void {
  const e = failure(bytes, options);
  expect(e.code).toBe(code);
  expect(e.message).toBe(message);
}

describe('FITS reader: structural errors', () => {
  it('reads the well-formed base file', () => {
    const s = parseFitsSpectrum(good(), 'good.fits');
    expect(Array.from(s.flux)).toEqual([1, 2, 3, 4, 5]);
    expect(Array.from(s.wavelength)).toEqual([6000, 6001, 6002, 6003, 6004]);
  });

  it('rejects an empty file', () => {
    expect(() => parseSpectrum(new Uint8Array(0), 'empty.fits')).toThrow('empty.fits: the file is empty');
    expectFailure(new Uint8Array(0), 'io.empty-file', 'bad.fits: the file is empty');
  });

  it('rejects a file that is not FITS', () => {
    expectFailure(new TextEncoder().encode('wavelength,flux\n1,2\n'), 'fits.not-fits', 'bad.fits: HDU 0: card 1: the file does not start with SIMPLE = T, so it is not a FITS file (FITS Standard 4.0 §4.4.1.1)');
  });

  it('rejects a file truncated inside the header or the data', () => {
    const bytes = good();
    expectFailure(bytes.slice(0, 400), 'fits.missing-end', 'bad.fits: HDU 0: no END card: the header runs to the end of the file (byte 400) after 5 cards; the file is truncated or not FITS');
    expectFailure(bytes.slice(0, 2880 + 8), 'fits.data-beyond-end', 'bad.fits: HDU 0: byte 2880: the header declares 20 bytes of data (NAXIS1 × 4) but the file has only 8 bytes after this header: the file is truncated or an NAXISn is wrong (FITS Standard 4.0 §4.4.1)');
  });

  it('rejects a header whose last block is cut short', () => {
    expectFailure(good().slice(0, 1000), 'fits.partial-block', 'bad.fits: HDU 0: the header ends with its END card at byte 720, but its last block is cut short: the file ends at byte 1000, and a header fills whole 2880-byte blocks (FITS Standard 4.0 §3.1)');
  });

  it('says the END card may be missing when the header runs into binary data', () => {
    const cards = primary1d(720, Array.from({ length: 32 }, (_, i) => card(`KEY${i}`, String(i))));
    const bytes = buildFits([{ cards, end: false, data: float32Bytes(Array.from({ length: 720 }, (_, i) => i)) }]);
    expectFailure(bytes, 'fits.non-printable', 'bad.fits: HDU 0: card 37: byte 2880: holds byte 0x00 at column 1; header cards are ASCII text, characters 32 to 126 (FITS Standard 4.0 §4.1.1). The header may lack its END card, or be damaged');
  });

  it('rejects a non-printable character in a card, naming card, keyword and column', () => {
    const bytes = good();
    bytes[80 * 2 + 20] = 0x09;
    expectFailure(bytes, 'fits.non-printable', 'bad.fits: HDU 0: card 3 (NAXIS): byte 180: holds byte 0x09 at column 21; header cards are ASCII text, characters 32 to 126 (FITS Standard 4.0 §4.1.1)');
  });

  it.each([
    ['BITPIX', '12', 'fits.bad-bitpix', 'bad.fits: HDU 0: card 2 (BITPIX): BITPIX = 12 is not one of 8, 16, 32, 64, -32, -64 (FITS Standard 4.0 §4.4.1.1, Table 8)'],
    ['NAXIS', '-1', 'fits.bad-naxis', 'bad.fits: HDU 0: card 3 (NAXIS): NAXIS = -1 is outside 0 to 999 (FITS Standard 4.0 §4.4.1.1)'],
    ['NAXIS', '1000', 'fits.bad-naxis', 'bad.fits: HDU 0: card 3 (NAXIS): NAXIS = 1000 is outside 0 to 999 (FITS Standard 4.0 §4.4.1.1)'],
    ['NAXIS1', '-5', 'fits.bad-naxis', 'bad.fits: HDU 0: card 4 (NAXIS1): NAXIS1 = -5 is negative; axis lengths are 0 or more (FITS Standard 4.0 §4.4.1.1)'],
    ['NAXIS1', "'five'", 'fits.bad-keyword-value', "bad.fits: HDU 0: card 4 (NAXIS1): NAXIS1 must be an integer, not 'five' (FITS Standard 4.0 §4.4.1)"],
    ['NAXIS1', '5.0', 'fits.bad-keyword-value', 'bad.fits: HDU 0: card 4 (NAXIS1): NAXIS1 must be an integer, not 5.0 (FITS Standard 4.0 §4.4.1)'],
  ])('rejects %s = %s', (keyword, value, code, message) => {
    const cards = primary1d(5).map((c) => (c.startsWith(keyword.padEnd(8)) ? card(keyword, value) : c));
    expectFailure(buildFits([{ cards, data: FLUX }]), code, message);
  });

  it('rejects a missing mandatory keyword', () => {
    const cards = primary1d(5).filter((c) => !c.startsWith('BITPIX'));
    expectFailure(buildFits([{ cards, data: FLUX }]), 'fits.missing-keyword', 'bad.fits: HDU 0: keyword BITPIX: the mandatory keyword BITPIX is missing (FITS Standard 4.0 §4.4.1)');
  });

  it('rejects declared data larger than the file, without allocating it', () => {
    const huge = (cards: string[]) => buildFits([{ cards, data: FLUX }]);
    expectFailure(huge(primary1d(1_000_000)), 'fits.data-beyond-end', 'bad.fits: HDU 0: byte 2880: the header declares 4000000 bytes of data (NAXIS1 × 4) but the file has only 2880 bytes after this header: the file is truncated or an NAXISn is wrong (FITS Standard 4.0 §4.4.1)');
    // Beyond 2^53 (a bigint in the header) and products that overflow doubles.
    expectFailure(huge(primary1d(5).map((c) => (c.startsWith('NAXIS1') ? card('NAXIS1', '99999999999999999999999') : c))), 'fits.data-beyond-end', `bad.fits: HDU 0: byte 2880: the header declares ${BigInt(Number.MAX_SAFE_INTEGER) * 4n} bytes of data (NAXIS1 × 4) but the file has only 2880 bytes after this header: the file is truncated or an NAXISn is wrong (FITS Standard 4.0 §4.4.1)`);
    const cards = [card('SIMPLE', 'T'), card('BITPIX', '-64'), card('NAXIS', '3'), card('NAXIS1', '4294967296'), card('NAXIS2', '4294967296'), card('NAXIS3', '4294967296')];
    expect(failure(huge(cards)).code).toBe('fits.data-beyond-end');
  });

  it('rejects an unterminated string', () => {
    const bytes = buildFits([{ cards: primary1d(5, ["OBJECT  = 'LVAC-7"]), data: FLUX }]);
    expectFailure(bytes, 'fits.unterminated-string', 'bad.fits: HDU 0: card 5 (OBJECT): the string value has no closing quote');
  });

  it('rejects a bad extension header after a good primary HDU', () => {
    const bytes = buildFits([{ cards: primary1d(5, [card('EXTEND', 'T')]), data: FLUX }, { cards: [card('XTENSION', "'IMAGE'"), card('BITPIX', '-32'), card('NAXIS', '1'), card('NAXIS1', '5'), card('GCOUNT', '1')], data: FLUX }]);
    expectFailure(bytes, 'fits.missing-keyword', 'bad.fits: HDU 1: keyword PCOUNT: the mandatory keyword PCOUNT is missing (FITS Standard 4.0 §4.4.1)');
  });
});

describe('FITS reader: data and WCS errors', () => {
  it('rejects a 2-D image, giving its size', () => {
    const bytes = buildFits([{ cards: [card('SIMPLE', 'T'), card('BITPIX', '8'), card('NAXIS', '2'), card('NAXIS1', '1024'), card('NAXIS2', '768')], data: new Uint8Array(1024 * 768) }]);
    expectFailure(bytes, 'fits.image-not-spectrum', 'bad.fits: HDU 0 holds a 2-D image of 1024×768 pixels, not a 1-D spectrum; extract the spectrum first');
  });

  it('rejects an HDU number that does not exist, and an HDU without a spectrum', () => {
    expectFailure(good(), 'fits.no-such-hdu', 'bad.fits: HDU 3 does not exist: the file has 1 HDU (0 to 0)', { hdu: 3 });
    expect(() => parseFitsSpectrum(good(), 'x.fits', { hdu: -1 })).toThrow(UsageError);
    expect(() => parseFitsSpectrum(good(), 'x.fits', { hdu: 1.5 })).toThrow('the HDU number must be an integer 0 or more, not 1.5');
    expectFailure(fixtureBytes('multi_hdu.fits'), 'fits.no-spectrum', 'bad.fits: HDU 0 holds no data, not a 1-D spectrum', { hdu: 0 });
    expectFailure(fixtureBytes('multi_hdu.fits'), 'fits.image-not-spectrum', 'bad.fits: HDU 1 holds a 2-D image of 30×20 pixels, not a 1-D spectrum; extract the spectrum first', { hdu: 1 });
    expect(parseFitsSpectrum(fixtureBytes('multi_hdu.fits'), 'm.fits', { hdu: 2 }).source?.hdu).toBe(2);
  });

  it('rejects a primary HDU without data and no extension', () => {
    expectFailure(buildFits([{ cards: [card('SIMPLE', 'T'), card('BITPIX', '8'), card('NAXIS', '0')] }]), 'fits.no-spectrum', 'bad.fits: no HDU holds a 1-D spectrum (HDU 0: no data)');
  });

  it.each([
    ["'FREQ'", 'fits.not-wavelength-axis', "bad.fits: HDU 0: card 8 (CTYPE1): CTYPE1 = 'FREQ' is not a wavelength axis; lineshift reads WAVE, AWAV (optionally -LOG), LINEAR or a blank CTYPE1"],
    ["'WAVE-TAB'", 'fits.unsupported-wcs', "bad.fits: HDU 0: card 8 (CTYPE1): CTYPE1 = 'WAVE-TAB': the algorithm code -TAB is not supported; lineshift reads linear and -LOG spectral axes (Greisen et al. 2006, A&A 446, 747)"],
  ])('rejects CTYPE1 = %s', (ctype, code, message) => {
    const bytes = buildFits([{ cards: primary1d(5, [card('CRVAL1', '6000.0'), card('CDELT1', '1.0'), card('CRPIX1', '1.0'), card('CTYPE1', ctype)]), data: FLUX }]);
    expectFailure(bytes, code, message);
  });

  it('rejects an unknown CUNIT1, a zero step and a non-numeric CRVAL1', () => {
    const wcs = (extra: string[]) => buildFits([{ cards: primary1d(5, extra), data: FLUX }]);
    expectFailure(wcs([card('CRVAL1', '6000.0'), card('CDELT1', '1.0'), card('CRPIX1', '1.0'), card('CUNIT1', "'furlong'")]), 'fits.unknown-unit', "bad.fits: HDU 0: card 8 (CUNIT1): CUNIT1 = 'furlong' is not a wavelength unit lineshift knows (Angstrom, nm, um, m, cm, mm, pixel)");
    expectFailure(wcs([card('CRVAL1', '6000.0'), card('CDELT1', '0.0'), card('CRPIX1', '1.0'), card('CUNIT1', "'nm'")]), 'fits.zero-step', 'bad.fits: HDU 0: card 6 (CDELT1): the wavelength step (CDELT1 or CD1_1) is 0, so every pixel has the same wavelength');
    expectFailure(wcs([card('CRVAL1', "'6000'"), card('CDELT1', '1.0')]), 'fits.bad-keyword-value', "bad.fits: HDU 0: card 5 (CRVAL1): CRVAL1 must be a finite number, not '6000'");
    expectFailure(wcs([card('BSCALE', "'2'")]), 'fits.bad-keyword-value', 'bad.fits: HDU 0: card 5 (BSCALE): BSCALE must be a number, not "2"');
  });

  it('rejects a linear WCS whose step is below float64 resolution (repeated wavelengths)', () => {
    const bytes = buildFits([{ cards: primary1d(5, [card('CRVAL1', '1.0E10'), card('CDELT1', '1.0E-7'), card('CRPIX1', '1.0'), card('CUNIT1', "'Angstrom'")]), data: FLUX }]);
    expectFailure(bytes, 'spectrum.duplicate-wavelength', 'bad.fits: HDU 0: index 1: wavelength 10000000000 is repeated at pixels 0 and 1');
  });

  it('rejects non-monotonic, duplicated and NaN wavelengths in a table', () => {
    const table = (waves: number[]) => buildFits([
      { cards: [card('SIMPLE', 'T'), card('BITPIX', '8'), card('NAXIS', '0'), card('EXTEND', 'T')] },
      {
        cards: [card('XTENSION', "'BINTABLE'"), card('BITPIX', '8'), card('NAXIS', '2'), card('NAXIS1', '12'), card('NAXIS2', String(waves.length)), card('PCOUNT', '0'), card('GCOUNT', '1'), card('TFIELDS', '2'), card('TTYPE1', "'WAVE'"), card('TFORM1', "'1D'"), card('TUNIT1', "'Angstrom'"), card('TTYPE2', "'FLUX'"), card('TFORM2', "'1E'")],
        data: interleave(waves),
      },
    ]);
    expect(Array.from(parseFitsSpectrum(table([1, 2, 3, 4]), 't.fits').wavelength)).toEqual([1, 2, 3, 4]);
    expectFailure(table([1, 2, 2, 3]), 'spectrum.duplicate-wavelength', 'bad.fits: HDU 1: index 2: wavelength 2 is repeated at pixels 1 and 2');
    expectFailure(table([1, 3, 2, 4]), 'spectrum.not-monotonic', 'bad.fits: HDU 1: index 2: the spectral axis is not monotonic: it turns at pixel 2 (3 then 2)');
    expectFailure(table([1, NaN, 3, 4]), 'spectrum.bad-wavelength', 'bad.fits: HDU 1: index 1: wavelength at pixel 1 is NaN, not a finite number');
  });

  it('rejects a table whose rows run past the end of the file, and a vector column in a row-per-pixel table', () => {
    const bytes = fixtureBytes('table_rows.fits');
    expectFailure(bytes.slice(0, 2880 * 2 + 1000), 'fits.data-beyond-end', 'bad.fits: HDU 1: byte 5760: the header declares 1600 bytes of data (NAXIS1 × NAXIS2) but the file has only 1000 bytes after this header: the file is truncated or an NAXISn is wrong (FITS Standard 4.0 §4.4.1)');
    const mixed = buildFits([
      { cards: [card('SIMPLE', 'T'), card('BITPIX', '8'), card('NAXIS', '0')] },
      { cards: [card('XTENSION', "'BINTABLE'"), card('BITPIX', '8'), card('NAXIS', '2'), card('NAXIS1', '16'), card('NAXIS2', '3'), card('PCOUNT', '0'), card('GCOUNT', '1'), card('TFIELDS', '2'), card('TTYPE1', "'WAVE'"), card('TFORM1', "'1D'"), card('TTYPE2', "'FLUX'"), card('TFORM2', "'2E'")], data: new Uint8Array(48) },
    ]);
    expectFailure(mixed, 'fits.column-length', 'bad.fits: HDU 1: column FLUX: column FLUX holds 2 values per row, but the table has one pixel per row (column WAVE holds 1)');
  });

  it('rejects bad TFORMs, columns wider than a row, and vector columns of different lengths', () => {
    const bintable = (extra: string[], naxis1 = 12, data: Uint8Array = new Uint8Array(12)) => buildFits([
      { cards: [card('SIMPLE', 'T'), card('BITPIX', '8'), card('NAXIS', '0')] },
      { cards: [card('XTENSION', "'BINTABLE'"), card('BITPIX', '8'), card('NAXIS', '2'), card('NAXIS1', String(naxis1)), card('NAXIS2', '1'), card('PCOUNT', '0'), card('GCOUNT', '1'), ...extra], data },
    ]);
    expectFailure(bintable([card('TFIELDS', '1'), card('TTYPE1', "'WAVE'"), card('TFORM1', "'1Z'")]), 'fits.bad-tform', "bad.fits: HDU 1: card 10 (TFORM1): TFORM1 = '1Z' is not a binary-table format rT (r a repeat count, T one of L X B I J K A E D C M P Q; FITS Standard 4.0 §7.3.1, Table 18)");
    expectFailure(bintable([card('TFIELDS', '1'), card('TTYPE1', "'WAVE'")]), 'fits.bad-tform', 'bad.fits: HDU 1: keyword TFORM1: TFORM1 is missing; every column needs a format (FITS Standard 4.0 §7.3.1)');
    expectFailure(bintable([card('TFIELDS', '2'), card('TFORM1', "'1D'"), card('TFORM2', "'99999999999999E'")]), 'fits.columns-exceed-row', "bad.fits: HDU 1: card 10 (TFORM2): the columns up to TFORM2 = '99999999999999E' need 400000000000004 bytes per row but NAXIS1 = 12 (FITS Standard 4.0 §7.3.1: NAXIS1 is the sum of the column widths)");
    expectFailure(bintable([card('TFIELDS', '1000')]), 'fits.bad-keyword-value', 'bad.fits: HDU 1: card 8 (TFIELDS): TFIELDS = 1000 is not an integer from 0 to 999 (FITS Standard 4.0 §7.3.1)');
    const vector = bintable([card('TFIELDS', '2'), card('TTYPE1', "'WAVELENGTH'"), card('TFORM1', "'3D'"), card('TTYPE2', "'FLUX'"), card('TFORM2', "'2E'")], 32, float64Bytes([1, 2, 3, 0]));
    expectFailure(vector, 'fits.column-length', 'bad.fits: HDU 1: column FLUX: column FLUX holds 2 values but column WAVELENGTH holds 3; they must be the same length');
  });
});

describe('FITS reader: odd but readable input', () => {
  it('keeps __proto__ and constructor keywords as plain keys', () => {
    const bytes = buildFits([{ cards: primary1d(5, ['HIERARCH __proto__ = 1', "HIERARCH constructor = 'x'", card('__PROTO_', "'y'"), card('TOSTRING', '3')]), data: FLUX }]);
    const s = parseFitsSpectrum(bytes, 'proto.fits');
    expect(s.header.get('__proto__')).toBe(1);
    expect(s.header.get('constructor')).toBe('x');
    expect(s.header.get('__PROTO_')).toBe('y');
    expect(s.header.get('toString')).toBe(3);
    expect(({} as Record<string, unknown>).x).toBeUndefined();
    expect(Object.prototype.hasOwnProperty.call(Object.prototype, 'y')).toBe(false);
  });

  it('joins CONTINUE strings, keeps stray CONTINUE cards and a final & without CONTINUE', () => {
    const bytes = buildFits([{
      cards: primary1d(5, ["LONG    = 'abc &'", "CONTINUE  'def&' / one", "CONTINUE  'ghi' / two", "AMP     = 'end&'", "CONTINUE  no string here", "QQ      = 'it''s'"]),
      data: FLUX,
    }]);
    const s = parseFitsSpectrum(bytes, 'c.fits');
    expect(s.header.card('LONG')).toEqual({ keyword: 'LONG', value: 'abc defghi', comment: 'one two' });
    expect(s.header.get('AMP')).toBe('end&');
    expect(s.header.cards.find((c) => c.keyword === 'CONTINUE')?.text).toBe('  no string here');
    expect(s.header.get('QQ')).toBe("it's");
  });

  it('warns about a malformed value and keeps it as text; reads lower-case exponents', () => {
    const log = collectingLogger();
    const bytes = buildFits([{ cards: primary1d(5, ['DATE-OBS= 2026-05-14', card('EXPTIME', '3.0d2')]), data: FLUX }]);
    const s = parseFitsSpectrum(bytes, 'w.fits', { logger: log });
    expect(s.header.get('DATE-OBS')).toBe('2026-05-14');
    expect(s.header.get('EXPTIME')).toBe(300);
    expect(log.warnings).toEqual([{ code: 'fits.malformed-value', message: 'w.fits: HDU 0: card 5 (DATE-OBS): the value "2026-05-14" is not a FITS string, logical, integer, real or complex number (FITS Standard 4.0 §4.2); kept as text' }]);
  });

  it('warns about a missing CRPIX1 and follows the standard default of 0', () => {
    const log = collectingLogger();
    const bytes = buildFits([{ cards: primary1d(5, [card('CRVAL1', '6000.0'), card('CDELT1', '2.0'), card('CUNIT1', "'Angstrom'")]), data: FLUX }]);
    const s = parseFitsSpectrum(bytes, 'p.fits', { logger: log });
    expect(s.wavelength[0]).toBe(6002);
    expect(log.warnings.map((w) => w.code)).toEqual(['fits.no-crpix']);
  });

  it('reads WAVE without CUNIT1 as metres when the values are metres, and as Å with a warning otherwise', () => {
    const wave = (crval: string, cdelt: string) => buildFits([{ cards: primary1d(5, [card('CTYPE1', "'WAVE'"), card('CRVAL1', crval), card('CDELT1', cdelt), card('CRPIX1', '1.0')]), data: FLUX }]);
    const log = collectingLogger();
    const m = parseFitsSpectrum(wave('6.0E-07', '1.0E-10'), 'm.fits', { logger: log });
    expect([m.unit, m.wavelength[0], m.medium]).toEqual(['angstrom', 6000, 'vacuum']);
    expect(log.warnings).toEqual([]);
    const a = parseFitsSpectrum(wave('6000.0', '1.0'), 'a.fits', { logger: log });
    expect([a.unit, a.wavelength[1]]).toEqual(['angstrom', 6001]);
    expect(log.warnings.map((w) => w.message)).toEqual(['a.fits: HDU 0: keyword CUNIT1: CUNIT1 is missing; CTYPE1 WAVE defaults to metres (Greisen et al. 2006), but CRVAL1 = 6000 cannot be metres, so Å is assumed (pass a unit to override)']);
    expect(parseFitsSpectrum(wave('6000.0', '1.0'), 'a.fits', { unit: 'nm' }).unit).toBe('nm');
  });

  it('reads a 3-D image whose other axes have length 1, and ignores trailing bytes with a warning', () => {
    const log = collectingLogger();
    const body = buildFits([{ cards: [card('SIMPLE', 'T'), card('BITPIX', '-32'), card('NAXIS', '3'), card('NAXIS1', '5'), card('NAXIS2', '1'), card('NAXIS3', '1')], data: FLUX }]);
    const bytes = new Uint8Array(body.length + 100);
    bytes.set(body);
    bytes.fill(0x41, body.length);
    const s = parseFitsSpectrum(bytes, 't.fits', { logger: log });
    expect(s.flux.length).toBe(5);
    expect(log.warnings.map((w) => w.message)).toEqual(['t.fits: byte 5760: 100 bytes after the last HDU do not start an extension (XTENSION) and were ignored']);
  });

  it('reads a last data unit that lacks its block padding, with a warning', () => {
    const log = collectingLogger();
    const bytes = good().slice(0, 2880 + 20);
    expect(Array.from(parseFitsSpectrum(bytes, 'p.fits', { logger: log }).flux)).toEqual([1, 2, 3, 4, 5]);
    expect(log.warnings.map((w) => w.code)).toEqual(['fits.missing-padding']);
  });

  it('takes the medium from AIRORVAC or VACUUM when CTYPE1 does not say', () => {
    const with_ = (c: string) => parseFitsSpectrum(buildFits([{ cards: primary1d(5, [card('CTYPE1', "'LINEAR'"), card('CUNIT1', "'Angstrom'"), card('CRVAL1', '6000.0'), card('CDELT1', '1.0'), card('CRPIX1', '1.0'), c]), data: FLUX }]), 'm.fits').medium;
    expect(with_(card('AIRORVAC', "'air'"))).toBe('air');
    expect(with_(card('AIRORVAC', "'vac'"))).toBe('vacuum');
    expect(with_(card('VACUUM', 'F'))).toBe('air');
    expect(with_(card('OBJECT', "'x'"))).toBe(null);
  });
});

function interleave(waves: number[]): Uint8Array {
  const out = new Uint8Array(12 * waves.length);
  const view = new DataView(out.buffer);
  waves.forEach((w, i) => {
    view.setFloat64(12 * i, w, false);
    view.setFloat32(12 * i + 8, i, false);
  });
  return out;
}
