import { describe, expect, it } from 'vitest';
import { formatCell, formatMeasured, formatNumber, formatProbability, formatSignificant, observationLabel, observationOf } from '../../src/report/format.js';
import { Header } from '../../src/spectrum/header.js';

describe('formatMeasured: value ± uncertainty rounded on two significant digits of the uncertainty (common practice)', () => {
  it.each([
    [6562.23924, 0.0561299, 'Å', '6562.239 ± 0.056 Å'],
    [19.0622627, 0.1504830, undefined, '19.06 ± 0.15'],
    [-17.7512, 0.4123, 'km/s', '−17.75 ± 0.41 km/s'],
    [12345, 1234, undefined, '12300 ± 1200'],
    [41.52, 12.3, undefined, '42 ± 12'],
    // Rounding carries into a new digit: 0.0996 → 0.10, so the value keeps two decimals.
    [0.0996, 0.0996, undefined, '0.10 ± 0.10'],
    [3.14159, 0.000995, undefined, '3.1416 ± 0.0010'],
    // A BJD stays fixed-point; a large length rounded to thousands takes a power of ten.
    [2460801.81234, 2.61, 'BJD_TDB', '2460801.8 ± 2.6 BJD_TDB'],
    [11430000, 171000, 'km', '(1.143 ± 0.017) × 10⁷ km'],
    [3.21e-5, 1.23e-6, undefined, '(3.21 ± 0.12) × 10⁻⁵'],
    [0.01608, 0.000702, 'M☉', '0.01608 ± 0.00070 M☉'],
  ])('%s ± %s %s → %s', (value, sigma, unit, text) => {
    expect(formatMeasured(value, sigma, unit)).toBe(text);
  });

  it('says when the uncertainty is missing or zero, and prints non-finite values', () => {
    expect(formatMeasured(6562.2392, NaN, 'Å')).toBe('6562.24 ± n/a Å');
    expect(formatMeasured(1.5, -1)).toBe('1.50000 ± n/a');
    expect(formatMeasured(4861.35, 0)).toBe('4861.35 ± 0');
    expect(formatMeasured(NaN, 0.5)).toBe('NaN ± 0.50');
    expect(formatMeasured(-Infinity, NaN)).toBe('−∞');
  });

  it('keeps the uncertainty within 5 % of its unrounded value', () => {
    for (let k = 0; k < 500; k++) {
      const sigma = 10 ** (-6 + 12 * ((k * 0.618034) % 1));
      const text = formatMeasured(1, sigma);
      const m = /± ([0-9.]+)(?:\) × 10([⁻⁰¹²³⁴⁵⁶⁷⁸⁹]+))?/.exec(text);
      expect(m, text).not.toBeNull();
      const exponent = m![2] ? Number(m![2].replace(/[⁻⁰¹²³⁴⁵⁶⁷⁸⁹]/g, (c) => String('⁰¹²³⁴⁵⁶⁷⁸⁹'.indexOf(c)).replace('-1', '-'))) : 0;
      const shown = Number(m![1]) * 10 ** exponent;
      expect(Math.abs(shown - sigma) / sigma, text).toBeLessThanOrEqual(0.05);
    }
  });
});

describe('number formats', () => {
  it.each([
    [0.000123456, 3, '1.23 × 10⁻⁴'],
    [6562.7951, 5, '6562.8'],
    [46.93, 3, '46.9'],
    [-0.5, 2, '−0.50'],
    [2460801.8, 6, '2.46080 × 10⁶'],
    [0, 3, '0'],
  ])('formatSignificant(%s, %s) = %s', (v, digits, text) => {
    expect(formatSignificant(v, digits)).toBe(text);
  });

  it.each([
    [0.1, '10%'],
    [0.001, '0.1%'],
    [0.0063, '0.63%'],
    [3.2e-7, '3.2 × 10⁻⁷'],
    [0, '< 10⁻³⁰⁰'],
  ])('formatProbability(%s) = %s', (p, text) => {
    expect(formatProbability(p)).toBe(text);
  });

  it('formatNumber uses the minus sign and keeps JavaScript digits without a decimal count', () => {
    expect(formatNumber(-12.345, 2)).toBe('−12.35');
    expect(formatNumber(0.5)).toBe('0.5');
    expect(formatNumber(-Infinity)).toBe('−∞');
  });

  it('formatCell rounds a value with uncertainty on the uncertainty when the column has no decimals', () => {
    expect(formatCell({ value: 12.3456, uncertainty: 0.0123 }, {})).toBe('12.346 ± 0.012');
    expect(formatCell({ value: 12.3456, uncertainty: 0.0123 }, { digits: 1 })).toBe('12.3 ± 0.0');
  });
});

describe('observation label from the header', () => {
  it('names the object and the UTC start of the exposure', () => {
    const header = Header.from([{ keyword: 'OBJECT', value: ' LVAC-7 ' }, { keyword: 'DATE-OBS', value: '2026-05-14T03:12:45.120' }]);
    expect(observationOf({ header })).toEqual({ object: 'LVAC-7', date: '2026-05-14 03:12:45 UTC' });
    expect(observationLabel({ header })).toBe('LVAC-7, 2026-05-14 03:12:45 UTC');
  });

  it('gives what is known, the time scale when it is not UTC, and nothing for an empty header', () => {
    expect(observationLabel({ header: Header.from([{ keyword: 'DATE-OBS', value: '2026-05-14' }]) })).toBe('2026-05-14');
    expect(observationLabel({ header: Header.from([{ keyword: 'DATE-OBS', value: '2026-05-14T03:12' }, { keyword: 'TIMESYS', value: 'TT' }]) })).toBe('2026-05-14 03:12 TT');
    expect(observationLabel({ header: Header.from([]) })).toBeUndefined();
  });
});
