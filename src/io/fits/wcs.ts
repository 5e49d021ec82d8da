/**
 * The spectral axis of a 1-D image from its world coordinate system (WCS) keywords.
 *
 * References: FITS Standard 4.0 §8 (WCS keywords); Greisen & Calabretta 2002, A&A 395,
 * 1061 ("Paper I": CRPIXj, CDELTi, CDi_j, PCi_j, CRVALi and their defaults); Greisen,
 * Calabretta, Valdes & Allen 2006, A&A 446, 747 ("Paper III": spectral types WAVE
 * (vacuum wavelength) and AWAV (air wavelength), default unit m, the `-LOG` algorithm
 * λ = λr·exp(w/λr)). The older DC-FLAG = 1 convention (λ = 10^(CRVAL1 + CDELT1·(p −
 * CRPIX1)), with CTYPE1 = 'LINEAR') is read too.
 */
import type { Medium, SpectralUnit } from '../../spectrum/spectrum.js';
import { parseSpectralUnit } from '../../spectrum/units.js';
import type { Header } from '../../spectrum/header.js';
import { fitsError, fitsWarn, type FitsContext } from './context.js';
import { keywordLocation, type FitsHdu } from './structure.js';

/**
 * Pixel coordinates given to a spectrum without a WCS: the 0-based pixel index, 0 … N−1
 * (the array index). FITS pixel coordinates (Paper I) are 1-based; a WCS's CRPIX1 is read
 * as such, and the writer writes CRPIX1 accordingly.
 */
export const PIXEL_INDEX_ORIGIN = 0;

/** How the spectral axis was found; used in messages and tests. */
export type AxisConvention = 'pixel-index' | 'linear' | 'log' | 'log10';

/** A spectral axis from a header. */
export interface SpectralAxis {
  readonly wavelength: Float64Array;
  readonly unit: SpectralUnit;
  readonly medium: Medium;
  readonly convention: AxisConvention;
  /**
   * True when the axis is finite and strictly monotonic by construction (a linear axis
   * whose step is far above float64 rounding), so that checking it again can be skipped.
   */
  readonly checked: boolean;
}

/** Options that supply what the file does not say. */
export interface AxisDefaults {
  unit?: SpectralUnit;
  medium?: Medium;
}

/** Metric units of length that are converted to Å on reading (Spectrum has no metre unit). */
const ANGSTROM_PER_METRIC: ReadonlyMap<string, number> = new Map([
  ['m', 1e10],
  ['cm', 1e8],
  ['mm', 1e7],
  ['pm', 1e-2],
]);

/** A wavelength unit read from a CUNIT1/TUNITn text: the library's unit and the factor from file values to it. */
export interface ResolvedUnit {
  readonly unit: SpectralUnit;
  readonly factor: number;
}

/**
 * Reads a unit text: Å, nm, µm and pixel as themselves; m, cm, mm and pm converted to Å
 * (so that `m` from a Paper III file gives sensible numbers). Undefined when unknown.
 */
export function resolveUnitText(text: string): ResolvedUnit | undefined {
  const t = text.trim();
  const known = parseSpectralUnit(t);
  if (known !== undefined) return { unit: known, factor: 1 };
  const metric = ANGSTROM_PER_METRIC.get(t.toLowerCase());
  if (metric !== undefined) return { unit: 'angstrom', factor: metric };
  if (/^10\*\*-10\s*m$/i.test(t) || /^1e-10\s*m$/i.test(t)) return { unit: 'angstrom', factor: 1 };
  return undefined;
}

/** Medium from a header convention other than CTYPE1: AIRORVAC = 'air'|'vac', or VACUUM = T|F. */
export function mediumFromCards(header: Header): Medium | undefined {
  const airOrVac = header.string('AIRORVAC')?.trim().toLowerCase();
  if (airOrVac === 'air') return 'air';
  if (airOrVac === 'vac' || airOrVac === 'vacuum') return 'vacuum';
  const vacuum = header.get('VACUUM');
  if (typeof vacuum === 'boolean') return vacuum ? 'vacuum' : 'air';
  return undefined;
}

interface CtypeInfo {
  kind: 'wave' | 'awav' | 'linear' | 'pixel';
  algorithm: 'linear' | 'log';
}

function parseCtype(ctype: string, hdu: FitsHdu, ctx: FitsContext): CtypeInfo {
  const t = ctype.trim().toUpperCase();
  if (t === '' || t === 'LINEAR' || t === 'WAVELENGTH' || t === 'LAMBDA') return { kind: 'linear', algorithm: 'linear' };
  if (t === 'PIXEL' || t === 'PIX') return { kind: 'pixel', algorithm: 'linear' };
  const m = /^([A-Z]{4})(?:-+([A-Z0-9]{1,3}))?$/.exec(t);
  const base = m?.[1];
  const code = m?.[2];
  if (base === 'WAVE' || base === 'AWAV') {
    if (code === undefined) return { kind: base === 'WAVE' ? 'wave' : 'awav', algorithm: 'linear' };
    if (code === 'LOG') return { kind: base === 'WAVE' ? 'wave' : 'awav', algorithm: 'log' };
    throw fitsError(ctx, 'fits.unsupported-wcs', `CTYPE1 = '${ctype.trim()}': the algorithm code -${code} is not supported; lineshift reads linear and -LOG spectral axes (Greisen et al. 2006, A&A 446, 747)`, keywordLocation(hdu, 'CTYPE1'));
  }
  throw fitsError(ctx, 'fits.not-wavelength-axis', `CTYPE1 = '${ctype.trim()}' is not a wavelength axis; lineshift reads WAVE, AWAV (optionally -LOG), LINEAR or a blank CTYPE1`, keywordLocation(hdu, 'CTYPE1'));
}

function numeric(hdu: FitsHdu, keyword: string, ctx: FitsContext): number | undefined {
  const v = hdu.header.get(keyword);
  if (v === undefined || v === null) return undefined;
  if (typeof v === 'number' && Number.isFinite(v)) return v;
  if (typeof v === 'bigint') return Number(v);
  throw fitsError(ctx, 'fits.bad-keyword-value', `${keyword} must be a finite number, not ${typeof v === 'string' ? `'${v}'` : String(v)}`, keywordLocation(hdu, keyword));
}

/**
 * The spectral axis of an image HDU of `n` pixels along axis 1.
 *
 * Method: pixel coordinate p = 1 … n (Paper I, §2.1); intermediate coordinate
 * w = s·(p − CRPIX1), with s = CD1_1 when present, otherwise CDELT1·PC1_1 (defaults
 * CRPIX1 = 0, CDELT1 = 1, PC1_1 = 1, Paper I §2.1–2.2); then λ = CRVAL1 + w (linear),
 * λ = CRVAL1·exp(w/CRVAL1) (`-LOG`, Paper III eq. 5), or λ = 10^(CRVAL1 + w) (DC-FLAG = 1).
 * Without CRVAL1, CDELT1 and CD1_1 the axis is the pixel index 0 … n−1.
 */
export function spectralAxis(hdu: FitsHdu, n: number, ctx: FitsContext, defaults: AxisDefaults = {}): SpectralAxis {
  const h = hdu.header;
  const crval = numeric(hdu, 'CRVAL1', ctx);
  const cdelt = numeric(hdu, 'CDELT1', ctx);
  const cd = numeric(hdu, 'CD1_1', ctx);
  const ctypeValue = h.get('CTYPE1');
  if (ctypeValue !== undefined && ctypeValue !== null && typeof ctypeValue !== 'string') {
    throw fitsError(ctx, 'fits.bad-keyword-value', `CTYPE1 must be a string, not ${String(ctypeValue)}`, keywordLocation(hdu, 'CTYPE1'));
  }
  const ctype = parseCtype(typeof ctypeValue === 'string' ? ctypeValue : '', hdu, ctx);
  if (crval === undefined && cdelt === undefined && cd === undefined) {
    if (typeof ctypeValue === 'string' && ctypeValue.trim() !== '' && ctype.kind !== 'pixel') {
      fitsWarn(ctx, 'fits.no-wcs-values', `CTYPE1 = '${ctypeValue.trim()}' but there is no CRVAL1, CDELT1 or CD1_1: the axis is read as the pixel index 0 to ${n - 1}`, keywordLocation(hdu, 'CTYPE1'));
    }
    return pixelIndexAxis(n);
  }
  let crpix = numeric(hdu, 'CRPIX1', ctx);
  if (crpix === undefined) {
    crpix = 0;
    fitsWarn(ctx, 'fits.no-crpix', 'CRPIX1 is missing, so the reference pixel is 0 (Greisen & Calabretta 2002, A&A 395, 1061) and pixel 1 lies at CRVAL1 + CDELT1; write CRPIX1 = 1 if CRVAL1 is the first pixel\'s wavelength', { hdu: hdu.index, keyword: 'CRPIX1' });
  }
  let step: number;
  if (cd !== undefined) {
    step = cd;
    if (cdelt !== undefined && cdelt !== cd) fitsWarn(ctx, 'fits.cd-and-cdelt', `both CD1_1 (${cd}) and CDELT1 (${cdelt}) are present; CD1_1 is used (Greisen & Calabretta 2002)`, keywordLocation(hdu, 'CDELT1'));
  } else if (cdelt !== undefined) {
    step = cdelt * (numeric(hdu, 'PC1_1', ctx) ?? 1);
  } else {
    step = 1;
    fitsWarn(ctx, 'fits.no-cdelt', 'neither CDELT1 nor CD1_1 is present; the step defaults to 1 per pixel (Greisen & Calabretta 2002)', { hdu: hdu.index, keyword: 'CDELT1' });
  }
  const ref = crval ?? 0;
  if (step === 0) throw fitsError(ctx, 'fits.zero-step', 'the wavelength step (CDELT1 or CD1_1) is 0, so every pixel has the same wavelength', keywordLocation(hdu, cd !== undefined ? 'CD1_1' : 'CDELT1'));

  // Algorithm: CTYPE1's -LOG, or the DC-FLAG = 1 log10 convention.
  let convention: AxisConvention = ctype.algorithm === 'log' ? 'log' : 'linear';
  const dcFlag = h.get('DC-FLAG');
  if (dcFlag === 1) {
    if (convention === 'log') fitsWarn(ctx, 'fits.dc-flag-ignored', `DC-FLAG = 1 is ignored because CTYPE1 = '${String(ctypeValue).trim()}' names the -LOG algorithm`, keywordLocation(hdu, 'DC-FLAG'));
    else convention = 'log10';
  }
  if (convention === 'log' && ref <= 0) {
    throw fitsError(ctx, 'fits.bad-keyword-value', `CRVAL1 = ${ref}: the -LOG algorithm needs a positive reference wavelength (Greisen et al. 2006)`, keywordLocation(hdu, 'CRVAL1'));
  }

  const unit = ctype.kind === 'pixel' ? { unit: 'pixel' as const, factor: 1 } : axisUnit(hdu, ctype, convention, ref, ctx, defaults);
  const wavelength = new Float64Array(n);
  const f = unit.factor;
  if (convention === 'linear') {
    for (let i = 0; i < n; i++) wavelength[i] = ref + step * (i + 1 - crpix);
  } else if (convention === 'log') {
    for (let i = 0; i < n; i++) wavelength[i] = ref * Math.exp((step * (i + 1 - crpix)) / ref);
  } else {
    for (let i = 0; i < n; i++) wavelength[i] = 10 ** (ref + step * (i + 1 - crpix));
  }
  if (f !== 1) for (let i = 0; i < n; i++) wavelength[i] *= f;
  // A linear axis v_i = ref + step·k_i is strictly monotonic when |step| exceeds the rounding
  // of the product and the sum, each at most half an ulp of the largest |v| (≈ 2^-53·max|v|);
  // a margin of 16·2^-52·max|v| covers both with room, and max|v| < 1e300 keeps it finite.
  const maxAbs = Math.max(Math.abs(ref), Math.abs(ref + step * (1 - crpix)), Math.abs(ref + step * (n - crpix)));
  const checked = convention === 'linear' && f === 1 && Number.isFinite(maxAbs) && maxAbs < 1e300 && Math.abs(step) > 16 * 2 ** -52 * maxAbs;
  return { wavelength, unit: unit.unit, medium: unit.unit === 'pixel' ? null : axisMedium(hdu, ctype, ctx, defaults), convention, checked };
}

/** The pixel-index axis 0 … n−1 (see {@link PIXEL_INDEX_ORIGIN}). */
export function pixelIndexAxis(n: number): SpectralAxis {
  const wavelength = new Float64Array(n);
  for (let i = 0; i < n; i++) wavelength[i] = i + PIXEL_INDEX_ORIGIN;
  return { wavelength, unit: 'pixel', medium: null, convention: 'pixel-index', checked: true };
}

function axisUnit(hdu: FitsHdu, ctype: CtypeInfo, convention: AxisConvention, crval: number, ctx: FitsContext, defaults: AxisDefaults): ResolvedUnit {
  const cunit = hdu.header.get('CUNIT1');
  if (typeof cunit === 'string' && cunit.trim() !== '') {
    const u = resolveUnitText(cunit);
    if (u === undefined) {
      throw fitsError(ctx, 'fits.unknown-unit', `CUNIT1 = '${cunit.trim()}' is not a wavelength unit lineshift knows (Angstrom, nm, um, m, cm, mm, pixel)`, keywordLocation(hdu, 'CUNIT1'));
    }
    return u;
  }
  // An older convention keeps the unit in WAT1_001 = 'wtype=linear label=Wavelength units=angstroms'.
  const wat = hdu.header.string('WAT1_001');
  const watUnit = wat === undefined ? undefined : /units=([A-Za-z]+)/.exec(wat)?.[1];
  if (watUnit !== undefined) {
    const u = resolveUnitText(watUnit);
    if (u !== undefined) return u;
  }
  if (defaults.unit !== undefined) return { unit: defaults.unit, factor: 1 };
  if (ctype.kind === 'wave' || ctype.kind === 'awav') {
    // Paper III: WAVE and AWAV default to metres. Values of ångström size written without
    // CUNIT1 are common, so a reference value above 1 mm is taken to be in Å, with a warning.
    const lambda = convention === 'log10' ? 10 ** crval : crval;
    if (Math.abs(lambda) < 1e-3) return { unit: 'angstrom', factor: 1e10 };
    fitsWarn(ctx, 'fits.unit-guessed', `CUNIT1 is missing; CTYPE1 ${ctype.kind.toUpperCase()} defaults to metres (Greisen et al. 2006), but CRVAL1 = ${crval} cannot be metres, so Å is assumed (pass a unit to override)`, { hdu: hdu.index, keyword: 'CUNIT1' });
    return { unit: 'angstrom', factor: 1 };
  }
  fitsWarn(ctx, 'fits.unit-guessed', 'CUNIT1 is missing; Å is assumed (pass a unit to override)', { hdu: hdu.index, keyword: 'CUNIT1' });
  return { unit: 'angstrom', factor: 1 };
}

function axisMedium(hdu: FitsHdu, ctype: CtypeInfo, ctx: FitsContext, defaults: AxisDefaults): Medium {
  const fromCards = mediumFromCards(hdu.header);
  if (ctype.kind === 'wave' || ctype.kind === 'awav') {
    const m: Medium = ctype.kind === 'wave' ? 'vacuum' : 'air';
    if (fromCards !== undefined && fromCards !== m) {
      fitsWarn(ctx, 'fits.medium-conflict', `CTYPE1 says ${m} wavelengths but AIRORVAC/VACUUM says ${fromCards}; CTYPE1 is used`, keywordLocation(hdu, 'CTYPE1'));
    }
    return m;
  }
  return fromCards ?? defaults.medium ?? null;
}
