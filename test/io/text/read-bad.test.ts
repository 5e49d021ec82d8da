import { describe, expect, it } from 'vitest';
import { InputError } from '../../../src/errors.js';
import { parseTextSpectrum } from '../../../src/io/text/read.js';
import { MAX_LINE_LENGTH } from '../../../src/io/text/fields.js';
import { collectingLogger } from '../../../src/logger.js';

const enc = (s: string) => new TextEncoder().encode(s);

function failure(input: string | Uint8Array): InputError {
  try {
    parseTextSpectrum(typeof input === 'string' ? enc(input) : input, 'bad.csv');
  } catch (e) {
    expect(e).toBeInstanceOf(InputError);
    return e as InputError;
  }
  throw new Error('expected an InputError');
}

// Each case: input, error code, exact message (file, 1-based line, column, detail).
const CASES: [string, string | Uint8Array, string, string][] = [
  ['ragged row', 'wavelength [nm],flux\n500,1\n501\n', 'text.ragged-row', 'bad.csv: line 3: the row has 1 column, but the header row (line 1) has 2'],
  ['ragged row without header', '# c\n500 1 0.1\n501 2 0.1\n502 3\n', 'text.ragged-row', 'bad.csv: line 4: the row has 2 columns, but the first row (line 2) has 3'],
  ['non-numeric flux cell', 'wavelength [nm],flux\n500,1\n501,abc\n', 'text.not-a-number', 'bad.csv: line 3: column 2: the flux cell "abc" is not a number'],
  ['non-numeric wavelength cell', '500,1\n5O1,2\n', 'text.not-a-number', 'bad.csv: line 2: column 1: the wavelength cell "5O1" is not a number'],
  ['non-numeric uncertainty cell', 'wavelength [nm],flux,err\n500,1,0.1\n501,2,-\n', 'text.not-a-number', 'bad.csv: line 3: column 3: the uncertainty cell "-" is not a number'],
  ['decimal comma', 'wavelength [nm];flux\n500;1,5\n', 'text.not-a-number', 'bad.csv: line 2: column 2: the flux cell "1,5" is not a number (decimal commas are not supported; use a point)'],
  ['hex number', '500,0x10\n501,1\n', 'text.not-a-number', 'bad.csv: line 1: column 2: the flux cell "0x10" is not a number'],
  ['one column', '500\n501\n', 'text.too-few-columns', 'bad.csv: line 1: the row has 1 column; a spectrum needs at least two (wavelength, flux)'],
  ['four columns, no header', '500,1,2,3\n', 'text.too-many-columns', 'bad.csv: line 1: the row has 4 columns and there is no header row; name the columns in a header row (e.g. "wavelength,flux,uncertainty")'],
  ['only comments', '# nothing\n\n# here\n', 'text.no-data', 'bad.csv: no data rows (only comments or blank lines)'],
  ['header only', 'wavelength [nm],flux\n', 'text.no-data', 'bad.csv: line 1: no data rows after the header row'],
  ['blank file', '\n\n  \n', 'text.no-data', 'bad.csv: no data rows (only comments or blank lines)'],
  ['duplicated wavelength', 'wavelength [nm],flux\n500,1\n501,1\n501,2\n', 'spectrum.duplicate-wavelength', 'bad.csv: line 4: column 1: wavelength 501 repeats the value on line 3; the axis must be strictly monotonic'],
  ['non-monotonic axis', 'wavelength [nm],flux\n# c\n500,1\n501,1\n\n499,2\n', 'spectrum.not-monotonic', 'bad.csv: line 6: column 1: wavelength 499 after 501 (line 4) breaks the increasing order; the axis must be strictly monotonic'],
  ['NaN wavelength', 'wavelength [nm],flux\n500,1\nNaN,1\n', 'text.bad-wavelength', 'bad.csv: line 3: column 1: the wavelength cell is NaN; every row needs a finite wavelength'],
  ['empty wavelength', 'wavelength [nm],flux\n500,1\n,1\n', 'text.bad-wavelength', 'bad.csv: line 3: column 1: the wavelength cell is empty; every row needs a finite wavelength'],
  ['infinite wavelength', 'wavelength [nm],flux\n500,1\ninf,1\n', 'text.bad-wavelength', 'bad.csv: line 3: column 1: the wavelength cell is Infinity; every row needs a finite wavelength'],
  ['unknown unit', 'wavelength [furlong],flux\n1,2\n', 'text.unknown-unit', 'bad.csv: line 1: column 1: unknown wavelength unit "furlong" in the header cell "wavelength [furlong]" (known: Angstrom, nm, um, pixel)'],
  ['unguessable unit', '12000000,1\n12000001,2\n', 'text.unknown-unit', 'bad.csv: the wavelength unit is not stated and cannot be guessed from the values (12000000 to 12000001); state it in the header row (e.g. "wavelength [nm]") or with the unit option'],
  ['unterminated quote', 'wavelength [nm],flux\n500,"1\n', 'text.bad-quote', 'bad.csv: line 2: a quote opened in field 2 is not closed on this line'],
  ['text after a quote', 'wavelength [nm],flux\n500,"1"x\n', 'text.bad-quote', 'bad.csv: line 2: unexpected text after a closing quote in field 2'],
  ['binary garbage', new Uint8Array([0x31, 0x2c, 0x32, 0x0a, 0x89, 0x50, 0x4e, 0x47, 0x00, 0x01]), 'text.binary', 'bad.csv: line 2: column 5: the file is not text: it holds the control byte 0x00 (a binary file?)'],
  ['UTF-16 text', new Uint8Array([0xff, 0xfe, 0x31, 0x00]), 'text.utf16', 'bad.csv: the file is UTF-16 text; save it as UTF-8 (or plain ASCII)'],
  ['duplicate column', 'wavelength [nm],flux,intensity\n500,1,1\n', 'text.duplicate-column', 'bad.csv: line 1: columns 2 ("flux") and 3 ("intensity") both name the flux'],
  ['missing flux column', 'wavelength [nm],sigma\n500,1\n', 'text.missing-column', 'bad.csv: line 1: the header row names no flux column (columns: "wavelength [nm]", "sigma")'],
  ['bad mask', 'wavelength [nm],flux,mask\n500,1,nan\n', 'text.bad-mask', 'bad.csv: line 2: column 3: the mask cell "nan" must be a finite number (0 = good, non-zero = bad)'],
  ['conflicting units', '# unit: nm\nwavelength [Angstrom],flux\n5000,1\n', 'text.conflicting-unit', 'bad.csv: line 1: the header row says the wavelength unit is Angstrom but this comment says nm'],
  ['unknown wavelength unit in a comment', '# wavelength unit: parsec\n500 1\n', 'text.unknown-unit', 'bad.csv: line 1: unknown wavelength unit "parsec" (known: Angstrom, nm, um, pixel)'],
  ['conflicting media', '# medium: air\n# medium: vacuum\n500 1\n', 'text.conflicting-medium', 'bad.csv: line 2: this comment says the medium is vacuum but line 1 says air'],
];

describe('parseTextSpectrum: bad input', () => {
  it.each(CASES)('%s', (_title, input, code, message) => {
    const e = failure(input);
    expect(e.code).toBe(code);
    expect(e.message).toBe(message);
  });

  it('rejects an absurdly long line without reading it all into a row', () => {
    const e = failure('wavelength [nm],flux\n' + '1'.repeat(MAX_LINE_LENGTH + 10) + ',1\n');
    expect(e.code).toBe('text.line-too-long');
    expect(e.message).toBe(`bad.csv: line 2: the line is longer than ${MAX_LINE_LENGTH} characters; this is not a table of numbers`);
  });

  it('reads invalid UTF-8 as Latin-1 with a warning (a header written by an old spreadsheet)', () => {
    const bytes = new Uint8Array([...enc('lambda ('), 0xc5, ...enc('),flux\n6500,1\n6501,2\n')]);
    const log = collectingLogger();
    const s = parseTextSpectrum(bytes, 'latin1.csv', { logger: log });
    expect(s.unit).toBe('angstrom');
    expect(log.warnings).toEqual([{ code: 'text.not-utf8', message: 'latin1.csv: the file is not valid UTF-8; read it as Latin-1' }]);
  });

  it('warns about an unknown medium, a bare unit that is no wavelength unit and a malformed metadata comment, and ignores them', () => {
    const log = collectingLogger();
    const s = parseTextSpectrum(enc('# medium: water\n# header: {oops\n# unit: ADU\n500 1\n501 2\n'), 'm.csv', { unit: 'nm', logger: log });
    expect(s.medium).toBeNull();
    expect(s.unit).toBe('nm');
    expect(log.warnings).toEqual([
      { code: 'text.unknown-medium', message: 'm.csv: line 1: unknown medium "water" (expected air or vacuum); ignored' },
      { code: 'text.bad-metadata', message: 'm.csv: line 2: a "# header:" comment that is not a header card in JSON; ignored' },
      { code: 'text.unknown-unit', message: 'm.csv: line 3: "ADU" is not a wavelength unit; this comment is ignored' },
    ]);
  });
});
