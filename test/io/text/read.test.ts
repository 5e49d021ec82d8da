import { describe, expect, it } from 'vitest';
import { parseTextSpectrum } from '../../../src/io/text/read.js';
import { parseSpectrum } from '../../../src/io/read.js';
import { collectingLogger } from '../../../src/logger.js';

const enc = (s: string) => new TextEncoder().encode(s);
const read = (s: string, options = {}) => parseTextSpectrum(enc(s), 'spec.txt', options);

describe('parseTextSpectrum: layouts', () => {
  it('reads CSV with a header row, units in brackets, CRLF and a BOM', () => {
    const s = read('\ufeffWavelength [nm],Flux [adu],Sigma\r\n656.0,1.5,0.1\r\n656.1,0.8,0.2\r\n');
    expect(s.unit).toBe('nm');
    expect(s.fluxUnit).toBe('adu');
    expect(Array.from(s.wavelength)).toEqual([656.0, 656.1]);
    expect(Array.from(s.flux)).toEqual([1.5, 0.8]);
    expect(Array.from(s.uncertainty!)).toEqual([0.1, 0.2]);
    expect(s.medium).toBeNull();
    expect(s.source).toEqual({ file: 'spec.txt', format: 'text' });
    expect(s.provenance.at(-1)?.step).toBe('read-text');
    expect(s.provenance.at(-1)?.parameters).toMatchObject({ delimiter: 'comma', unit: 'nm', unitFrom: 'header', rows: 2 });
  });

  it('reads TSV, semicolons and whitespace-aligned columns alike', () => {
    for (const [text, delimiter] of [
      ['wave (Å)\tflux\n6500\t1\n6501\t2\n', 'tab'],
      ['lambda(Å);intensity\n6500;1\n6501;2\n', 'semicolon'],
      ['  wl [Angstrom]   counts\n  6500   1\n\t6501  2   \n', 'whitespace'],
    ] as const) {
      const s = read(text);
      expect(s.unit).toBe('angstrom');
      expect(Array.from(s.flux)).toEqual([1, 2]);
      expect(s.provenance.at(-1)?.parameters.delimiter).toBe(delimiter);
    }
  });

  it('skips comment lines, trailing comments and blank lines; a last line without a newline is read', () => {
    const s = read('# a comment\n\nwavelength [nm], flux # the header\n# another\n500, 1 # first\n\n501, 2');
    expect(Array.from(s.wavelength)).toEqual([500, 501]);
    expect(Array.from(s.flux)).toEqual([1, 2]);
  });

  it('reads quoted CSV fields, including a delimiter and a # inside quotes', () => {
    const s = read('"wavelength (nm, air)","flux [erg/s/cm2/A, #2]"\n"500",1\n501,"2"\n');
    expect(s.medium).toBe('air');
    expect(s.fluxUnit).toBe('erg/s/cm2/A, #2');
    expect(Array.from(s.flux)).toEqual([1, 2]);
  });

  it('reads NaN, nan, empty flux cells as NaN and inf as infinity; exponents and Fortran D exponents', () => {
    const s = read('wavelength [Angstrom],flux,error\n6500,NaN,1\n6501,nan,\n6502,,1\n6503,inf,-Inf\n6.504e3,1.5D2,2E-1\n');
    expect(Array.from(s.flux)).toEqual([NaN, NaN, NaN, Infinity, 150]);
    expect(Array.from(s.uncertainty!)).toEqual([1, NaN, 1, -Infinity, 0.2]);
    expect(s.wavelength[4]).toBe(6504);
  });

  it('takes two columns as wavelength, flux and three as wavelength, flux, uncertainty without a header', () => {
    const two = read('6500 1\n6501 2\n', { unit: 'angstrom' });
    expect(two.uncertainty).toBeUndefined();
    const three = read('6500,1,0.5\n6501,2,0.25\n', { unit: 'angstrom' });
    expect(Array.from(three.uncertainty!)).toEqual([0.5, 0.25]);
  });

  it('reads a decreasing axis', () => {
    const s = read('wavelength [nm],flux\n700,1\n600,2\n500,3\n');
    expect(Array.from(s.wavelength)).toEqual([700, 600, 500]);
  });

  it('reads the unit and medium from names like wavelength_air_angstrom and from comment lines', () => {
    const a = read('wavelength_vac_nm,flux\n500,1\n501,1\n');
    expect([a.unit, a.medium]).toEqual(['nm', 'vacuum']);
    const b = read('# medium: air\n# wavelength unit: um\n# flux unit: W m-2 um-1\n0.5 1\n0.6 2\n');
    expect([b.unit, b.medium, b.fluxUnit]).toEqual(['um', 'air', 'W m-2 um-1']);
    expect(b.provenance.at(-1)?.parameters.unitFrom).toBe('comment');
  });

  it('reads a mask column (non-zero = bad)', () => {
    const s = read('wavelength [nm],flux,uncertainty,mask\n500,1,0.1,0\n501,2,0.1,4\n');
    expect(Array.from(s.mask!)).toEqual([0, 1]);
  });

  it('reads a pixel axis and sets the medium to null', () => {
    const s = read('# medium: air\npixel,counts\n0,5\n1,6\n2,7\n');
    expect(s.unit).toBe('pixel');
    expect(s.medium).toBeNull();
  });

  it('uses the unit and medium options when the file is silent, and warns when the file overrides them', () => {
    const s = read('500 1\n501 2\n', { unit: 'nm', medium: 'vacuum' });
    expect([s.unit, s.medium]).toEqual(['nm', 'vacuum']);
    expect(s.provenance.at(-1)?.parameters.unitFrom).toBe('option');
    const log = collectingLogger();
    const t = read('wavelength [Angstrom],flux\n5000,1\n5001,2\n', { unit: 'nm', logger: log });
    expect(t.unit).toBe('angstrom');
    expect(log.warnings).toEqual([{ code: 'text.option-ignored', message: 'spec.txt: the file states the wavelength unit Angstrom; the unit option (nm) is ignored' }]);
  });

  it('guesses the unit from the values only when nothing states it, with a warning', () => {
    const cases: [string, string, string][] = [
      ['350.5 1\n749.5 2\n', 'nm', '350.5 to 749.5'],
      ['3500 1\n11000 2\n', 'angstrom', '3500 to 11000'],
      ['0.35 1\n1.05 2\n', 'um', '0.35 to 1.05'],
      ['0 1\n1 2\n2 3\n', 'pixel', '0 to 2'],
    ];
    for (const [text, unit, range] of cases) {
      const log = collectingLogger();
      const s = read(text, { logger: log });
      expect(s.unit).toBe(unit);
      const symbol = unit === 'angstrom' ? 'Angstrom' : unit;
      expect(log.warnings).toEqual([
        {
          code: 'text.unit-guessed',
          message: `spec.txt: the wavelength unit is not stated; guessed ${symbol} from the values (${range}); state it in the header row (e.g. "wavelength [nm]") or with the unit option`,
        },
      ]);
    }
  });

  it('ignores unrecognised columns with a warning, and reads an unrecognised two-column header positionally', () => {
    const log = collectingLogger();
    const s = read('wavelength [nm],flux,airmass\n500,1,1.2\n501,2,1.2\n', { logger: log });
    expect(Array.from(s.flux)).toEqual([1, 2]);
    expect(log.warnings.map((w) => w.message)).toEqual(['spec.txt: line 1: column "airmass" not recognised; ignored']);
    const log2 = collectingLogger();
    const t = read('x,y\n500,1\n501,2\n', { unit: 'nm', logger: log2 });
    expect(Array.from(t.flux)).toEqual([1, 2]);
    expect(log2.warnings.map((w) => w.code)).toEqual(['text.header-unrecognised']);
  });

  it('drops an uncertainty column that is empty in every row (trailing delimiters), with a warning', () => {
    const log = collectingLogger();
    const s = read('500,1,\n501,2,\n', { unit: 'nm', logger: log });
    expect(s.uncertainty).toBeUndefined();
    expect(log.warnings.map((w) => w.code)).toEqual(['text.empty-column']);
  });

  it('is reached through parseSpectrum for non-FITS bytes', () => {
    expect(parseSpectrum(enc('wavelength [nm],flux\n500,1\n501,2\n'), 'a.csv').unit).toBe('nm');
  });

  it('does not modify its input bytes', () => {
    const bytes = enc('wavelength [nm],flux\n500,1\n501,2\n');
    const copy = bytes.slice();
    parseTextSpectrum(bytes, 'a.csv');
    expect(bytes).toEqual(copy);
  });
});
