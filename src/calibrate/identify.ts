/**
 * Identifying measured lamp lines (pixel positions) with the lines of a list (wavelengths),
 * with a rough hint or with none.
 *
 * Method (our own, built from standard pieces):
 * 1. **Reference lines.** List lines closer than the resolution (the median measured FWHM
 *    times the candidate dispersion) cannot be told apart: they are merged into one
 *    intensity-weighted line flagged `blend` (unless one component carries ≥ 10× the
 *    intensity of the rest, whose wavelength is then used). Only lines of one element can
 *    dominate: list intensities are given per element (NIST Handbook), and a lamp's mixture
 *    sets how bright each element's lines come out, so two elements merged are always a blend.
 * 2. **Triplet ratios.** For three lines at pixels p₁ < p₂ < p₃ the ratio
 *    r = (p₂ − p₁)/(p₃ − p₁) does not depend on the dispersion or the offset (for a locally
 *    linear dispersion), so it can be compared with the same ratio of three list lines.
 *    Triplets are formed from each measured line and two of its next four neighbours (so
 *    that a spurious peak or a missing line in between does not break the pattern), and from
 *    each list line and two of its next six neighbours, in the whole list and in its
 *    brighter half and third (so that list lines too faint to be seen can be skipped). For
 *    reversed spectra (λ decreasing with the pixel) r is compared with 1 − ρ. This is the
 *    idea of triangle matching in star-pattern recognition (e.g. Groth 1986, AJ 91, 1244;
 *    Valdes et al. 1995, PASP 107, 1119) brought down to one dimension.
 * 3. **Voting.** Each pair of matching triplets proposes a dispersion D (from the outer
 *    lines) and the wavelength at the middle pixel of the detector (extrapolated linearly).
 *    A proposal counts only when neighbouring peaks confirm it (of the two peaks beyond each
 *    end of the triplet, at least two — one for fewer than 20 peaks — fall on list lines
 *    where the proposal predicts them, within 1 pixel plus a curvature allowance, see
 *    {@link CURVATURE_ALLOWANCE}). Votes go into bins 4 % wide in ln |D| and N/25 pixels
 *    wide in wavelength, one vote per peak triplet and bin; bins are ranked by the excess
 *    of their votes (with their neighbours') over the background of their rows of
 *    dispersion, (n − e)/(e + 5). With a hint, only
 *    proposals that agree with it (within its accuracy in wavelength and its tolerance in
 *    dispersion, both at the triplet) are counted.
 * 4. **Verification by growth.** From the best-ranked bins (several seeds per bin, the
 *    brightest first), a seed's three pairs define a first map; the matched lines are
 *    refitted (order rising with their number, up to 3 — or the order asked, when higher),
 *    and every peak inside their range plus the nearest few outside it is matched to the
 *    nearest reference line within a tolerance — max(0.5 pixel, 4 σ of the centres,
 *    3 × RMS, at most twice the first), plus three times the fit's own prediction error
 *    there (which grows when extrapolating) — unless a comparably bright reference line is
 *    nearly as close; this repeats until nothing changes. The candidate that matches the most
 *    lines (then the smallest RMS) wins. A wrong seed rarely grows: the chance of a random
 *    line falling within the tolerance is the list's density times the tolerance,
 *    typically < 0.15.
 */
import { UsageError } from '../errors.js';
import type { LineList } from '../lines/linelist.js';
import { median } from '../lines/snr.js';
import { chebyshevRow, type Domain } from '../math/basis.js';
import { solveLinearLeastSquares } from '../math/linear-least-squares.js';
import { gratingDispersion, gratingPixelToWavelength, type GratingSetup } from './grating.js';
import { derivativePolynomial, evaluatePolynomial } from './polynomial.js';

/** A measured line: where it is, how precisely, how bright. */
export interface MeasuredPeak {
  /** Centre, in pixels (the coordinate of the spectrum's pixel axis, usually the 0-based index). */
  readonly pixel: number;
  /** 1-σ of the centre, pixels (NaN when unknown). */
  readonly pixelUncertainty: number;
  /** Brightness (peak height or integrated flux, any consistent unit); brighter lines seed the search first. */
  readonly strength: number;
  /** FWHM in pixels, when measured; used for merging unresolved list lines. */
  readonly fwhmPixels?: number;
}

/**
 * A rough idea of the wavelength scale:
 * - `range`: the first and last pixels of the detector see about these wavelengths;
 * - `linear`: the wavelength at a pixel (default the middle) and the dispersion;
 * - `grating`: the set-up's geometry ({@link GratingSetup}).
 * `accuracyAngstrom` says how far the true scale may lie from the hinted one at any pixel
 * (default 5 % of the hinted span); `dispersionTolerance` how far the local dispersion
 * may differ, as a fraction (default 0.15).
 */
export type WavelengthHint =
  | { readonly kind: 'range'; readonly minWavelengthAngstrom: number; readonly maxWavelengthAngstrom: number; readonly accuracyAngstrom?: number; readonly dispersionTolerance?: number; readonly reversed?: boolean }
  | { readonly kind: 'linear'; readonly centerWavelengthAngstrom: number; readonly dispersionAngstromPerPixel: number; readonly centerPixel?: number; readonly accuracyAngstrom?: number; readonly dispersionTolerance?: number }
  | { readonly kind: 'grating'; readonly setup: GratingSetup; readonly accuracyAngstrom?: number; readonly dispersionTolerance?: number };

/** Default accuracy of a hint, as a fraction of its wavelength span. */
export const DEFAULT_HINT_ACCURACY_FRACTION = 0.05;
/** Default tolerance on the hinted dispersion, as a fraction. */
export const DEFAULT_HINT_DISPERSION_TOLERANCE = 0.15;

/** A line of the reference list as used for identification (possibly several unresolved list lines merged). */
export interface LampReferenceLine {
  /** Air (or the list's medium) wavelength, Å; intensity-weighted mean when merged. */
  readonly wavelengthAngstrom: number;
  readonly species: string;
  /** Sum of the components' relative intensities (null when none is known). */
  readonly relativeIntensity: number | null;
  /** Number of list lines merged into this one. */
  readonly components: number;
  /** True when several list lines of comparable intensity were merged (unresolved blend): its wavelength depends on the intensity ratio, so it is not used in the solution. */
  readonly blend: boolean;
  /** True when the list marks the value as a blend already (fine-structure or multiplet centroid). */
  readonly listBlend: boolean;
}

/** Options of {@link identifyLampLines}. */
export interface LampIdentifyOptions {
  /** The lines the lamp should show (see `lampLineList`). */
  readonly list: LineList;
  /** Pixel range of the detector: the basis domain of the maps (default: the peaks' range widened by 1 %). */
  readonly domain?: Domain;
  /** Rough wavelength scale; without it the search is blind. */
  readonly hint?: WavelengthHint;
  /** Order of the dispersion polynomial that will be fitted (growth uses up to max(3, order)). Default 3. */
  readonly order?: number;
  /** Blind search: smallest and largest |dispersion| considered, Å per pixel. Default 0.01 and 200. */
  readonly dispersionRangeAngstromPerPixel?: readonly [number, number];
  /** Blind search: wavelength increasing with pixel, decreasing, or either (default). */
  readonly direction?: 'increasing' | 'decreasing' | 'either';
}

/** One identified line. */
export interface LineMatch {
  /** Index into the peaks given. */
  readonly peakIndex: number;
  readonly line: LampReferenceLine;
}

/** Why identification found nothing. */
export type IdentifyFailure = 'too-few-peaks' | 'no-pattern';

/** Result of {@link identifyLampLines}. */
export interface LampIdentifyResult {
  /** True when a candidate with at least 4 matched lines was found. */
  readonly ok: boolean;
  readonly reason: IdentifyFailure | null;
  readonly mode: 'hinted' | 'blind';
  readonly matches: readonly LineMatch[];
  /** The map found (Chebyshev coefficients over `domain`), or null. */
  readonly model: { readonly coefficients: readonly number[]; readonly order: number; readonly domain: Domain } | null;
  /** RMS of the matched lines about the map, pixels (NaN without a model). */
  readonly rmsPixels: number;
  /** The reference lines considered (merged at the resolution of the winning candidate). */
  readonly referenceLines: readonly LampReferenceLine[];
  /** Work done: triplet pairs voted, seeds grown. */
  readonly statistics: { readonly votes: number; readonly seedsGrown: number };
}

/** Hint as a function of the pixel, with its accuracy. */
interface HintModel {
  at(p: number): number;
  slope(p: number): number;
  accuracy: number;
  dispTol: number;
}

function hintModel(h: WavelengthHint, domain: Domain): HintModel {
  const span = (lo: number, hi: number) => Math.abs(hi - lo);
  const accuracyOf = (s: number) => {
    const a = h.accuracyAngstrom ?? DEFAULT_HINT_ACCURACY_FRACTION * s;
    if (!(a > 0)) throw new UsageError('calibrate.bad-hint', `the hint's accuracy must be > 0 Å, got ${a}`);
    return a;
  };
  const dispTol = h.dispersionTolerance ?? DEFAULT_HINT_DISPERSION_TOLERANCE;
  if (!(dispTol > 0 && dispTol < 1)) throw new UsageError('calibrate.bad-hint', `the hint's dispersion tolerance must be a fraction between 0 and 1, got ${dispTol}`);
  if (h.kind === 'range') {
    const { minWavelengthAngstrom: a, maxWavelengthAngstrom: b } = h;
    if (!(a > 0 && b > a)) throw new UsageError('calibrate.bad-hint', `the hinted range must have 0 < min < max Å, got ${a} to ${b}`);
    const [w0, w1] = h.reversed ? [b, a] : [a, b];
    const slope = (w1 - w0) / (domain.max - domain.min);
    return { at: (p) => w0 + slope * (p - domain.min), slope: () => slope, accuracy: accuracyOf(span(a, b)), dispTol };
  }
  if (h.kind === 'linear') {
    const c = h.centerWavelengthAngstrom, d = h.dispersionAngstromPerPixel;
    if (!(c > 0) || !Number.isFinite(d) || d === 0) throw new UsageError('calibrate.bad-hint', `the hint needs a positive central wavelength and a non-zero dispersion, got ${c} Å and ${d} Å/pixel`);
    const p0 = h.centerPixel ?? (domain.min + domain.max) / 2;
    return { at: (p) => c + d * (p - p0), slope: () => d, accuracy: accuracyOf(Math.abs(d) * (domain.max - domain.min)), dispTol };
  }
  const s = h.setup;
  const w0 = gratingPixelToWavelength(s, domain.min), w1 = gratingPixelToWavelength(s, domain.max);
  if (!Number.isFinite(w0) || !Number.isFinite(w1)) throw new UsageError('calibrate.bad-hint', 'the grating set-up gives no wavelength at the ends of the detector');
  return { at: (p) => gratingPixelToWavelength(s, p), slope: (p) => gratingDispersion(s, p), accuracy: accuracyOf(span(w0, w1)), dispTol };
}

/**
 * Merges list lines closer than `widthAngstrom` into intensity-weighted lines (see the
 * module's step 1). Unknown intensities count as the list's weakest known intensity.
 *
 * @param list line list sorted by wavelength.
 * @param widthAngstrom resolution element, Å (≥ 0; 0 merges nothing).
 * @returns merged reference lines, by wavelength.
 * @example mergeUnresolvedLines(lampLineList('neon'), 2).length;
 */
export function mergeUnresolvedLines(list: LineList, widthAngstrom: number): LampReferenceLine[] {
  const e = list.entries;
  const known = e.map((x) => x.relativeIntensity).filter((v): v is number => v !== null && v > 0);
  const weakest = known.length ? Math.min(...known) : 1;
  const out: LampReferenceLine[] = [];
  let i = 0;
  while (i < e.length) {
    let j = i + 1;
    while (j < e.length && e[j].wavelengthAngstrom - e[j - 1].wavelengthAngstrom < widthAngstrom) j++;
    const group = e.slice(i, j);
    const weights = group.map((x) => (x.relativeIntensity !== null && x.relativeIntensity > 0 ? x.relativeIntensity : weakest));
    const total = weights.reduce((a, b) => a + b, 0);
    const top = weights.indexOf(Math.max(...weights));
    const oneSpecies = group.every((x) => x.species === group[0].species);
    const dominated = group.length === 1 || (oneSpecies && weights[top] >= 10 * (total - weights[top]));
    const wavelength = dominated ? group[top].wavelengthAngstrom : group.reduce((s, x, k) => s + x.wavelengthAngstrom * weights[k], 0) / total;
    const intensities = group.map((x) => x.relativeIntensity).filter((v): v is number => v !== null);
    out.push({
      wavelengthAngstrom: wavelength,
      species: [...new Set(group.map((x) => x.species))].join('+'),
      relativeIntensity: intensities.length ? intensities.reduce((a, b) => a + b, 0) : null,
      components: group.length,
      blend: !dominated,
      listBlend: group.some((x) => x.blend),
    });
    i = j;
  }
  return out;
}

interface Candidate {
  matched: Int32Array; // per peak (sorted order): reference index or −1
  count: number;
  rmsPx: number;
  coefficients: Float64Array;
  order: number;
}

interface Context {
  px: Float64Array; // sorted pixels
  sig: Float64Array;
  ref: LampReferenceLine[];
  refW: Float64Array;
  refI: Float64Array;
  domain: Domain;
  maxGrowOrder: number;
  minTolPx: number;
  sign: 1 | -1 | 0;
}

function lowerBound(a: Float64Array, v: number): number {
  let lo = 0, hi = a.length;
  while (lo < hi) { const mid = (lo + hi) >> 1; if (a[mid] < v) lo = mid + 1; else hi = mid; }
  return lo;
}

function growOrder(n: number, max: number): number {
  const k = n < 4 ? 1 : n < 7 ? 2 : n < 12 ? 3 : n < 18 ? 4 : 5;
  return Math.min(k, max);
}

/** Unweighted Chebyshev fit with the coefficients' unscaled covariance (AᵀA)⁻¹. */
function fitWithCovariance(xs: readonly number[], ys: readonly number[], order: number, domain: Domain): { c: Float64Array; cov: Float64Array } {
  const n = order + 1;
  const a = new Float64Array(xs.length * n);
  const row = new Float64Array(n);
  for (let r = 0; r < xs.length; r++) a.set(chebyshevRow(xs[r], order, domain, row), r * n);
  const f = solveLinearLeastSquares(a, xs.length, n, ys);
  return { c: f.coefficients, cov: f.covariance };
}

/**
 * Verification by growth from seed pairs (indices into ctx.px and ctx.ref): the matched
 * lines are refitted, every peak inside their range and the nearest few outside it are
 * matched again under the fit, with a tolerance that adds the fit's own prediction error
 * (which grows when extrapolating), until nothing changes.
 */
function grow(ctx: Context, seed: readonly (readonly [number, number])[]): Candidate | null {
  const n = ctx.px.length;
  let matched = new Int32Array(n).fill(-1);
  for (const [i, r] of seed) matched[i] = r;
  let coefficients: Float64Array = new Float64Array(0);
  let order = 1;
  let rmsPx = NaN;
  let reach = 2;
  const row = new Float64Array(8);
  for (let iter = 0; iter < 60; iter++) {
    const xs: number[] = [], ys: number[] = [];
    const idx: number[] = [];
    for (let i = 0; i < n; i++) if (matched[i] >= 0) { xs.push(ctx.px[i]); ys.push(ctx.refW[matched[i]]); idx.push(i); }
    if (xs.length < 3) return null;
    order = growOrder(xs.length, ctx.maxGrowOrder);
    let cov: Float64Array;
    try {
      ({ c: coefficients, cov } = fitWithCovariance(xs, ys, order, ctx.domain));
    } catch {
      return null;
    }
    let ss = 0, ssA = 0;
    for (let k = 0; k < xs.length; k++) {
      const d = derivativePolynomial(coefficients, ctx.domain, xs[k]);
      const r = ys[k] - evaluatePolynomial(coefficients, ctx.domain, xs[k]);
      ss += (r / d) ** 2;
      ssA += r * r;
    }
    const dof = xs.length - order - 1;
    rmsPx = dof > 0 ? Math.sqrt(ss / dof) : 0;
    const midDisp = Math.abs(derivativePolynomial(coefficients, ctx.domain, (xs[0] + xs[xs.length - 1]) / 2));
    const s2 = Math.max(dof > 0 ? ssA / dof : 0, (ctx.minTolPx * midDisp / 4) ** 2);
    const base = Math.min(Math.max(ctx.minTolPx, 3 * rmsPx), 2 * ctx.minTolPx);
    const first = idx[0], last = idx[idx.length - 1];
    const next = new Int32Array(n).fill(-1);
    const claimDist = new Float64Array(ctx.ref.length).fill(Infinity);
    const claimBy = new Int32Array(ctx.ref.length).fill(-1);
    const nc = order + 1;
    for (let i = Math.max(0, first - reach); i <= Math.min(n - 1, last + reach); i++) {
      const p = ctx.px[i];
      const disp = derivativePolynomial(coefficients, ctx.domain, p);
      if (!(Math.abs(disp) > 0) || (ctx.sign !== 0 && Math.sign(disp) !== ctx.sign)) continue;
      chebyshevRow(p, order, ctx.domain, row);
      let v = 0;
      for (let a = 0; a < nc; a++) for (let b = 0; b < nc; b++) v += row[a] * cov[a * nc + b] * row[b];
      const tolPx = Math.min(base + (3 * Math.sqrt(Math.max(0, v * s2))) / Math.abs(disp), 8 * ctx.minTolPx);
      const pred = evaluatePolynomial(coefficients, ctx.domain, p);
      const tolA = tolPx * Math.abs(disp);
      let k = lowerBound(ctx.refW, pred - tolA);
      let best = -1, bestD = Infinity, second = -1, secondD = Infinity;
      for (; k < ctx.refW.length && ctx.refW[k] <= pred + tolA; k++) {
        const d = Math.abs(ctx.refW[k] - pred);
        if (d < bestD) { second = best; secondD = bestD; best = k; bestD = d; } else if (d < secondD) { second = k; secondD = d; }
      }
      if (best < 0) continue;
      if (second >= 0 && secondD < 2 * bestD + 0.25 * tolA && ctx.refI[second] * 3 >= ctx.refI[best]) continue; // ambiguous
      const dPx = bestD / Math.abs(disp);
      if (dPx < claimDist[best]) {
        if (claimBy[best] >= 0) next[claimBy[best]] = -1;
        claimDist[best] = dPx;
        claimBy[best] = i;
        next[i] = best;
      }
    }
    let same = true;
    for (let i = 0; i < n; i++) if (next[i] !== matched[i]) { same = false; break; }
    matched = next;
    if (same) {
      if (first - reach <= 0 && last + reach >= n - 1) break;
      reach *= 2;
    }
  }
  let count = 0;
  for (let i = 0; i < n; i++) if (matched[i] >= 0) count++;
  if (count < 3) return null;
  return { matched, count, rmsPx, coefficients, order };
}

interface Triplet { a: number; b: number; c: number; ratio: number }

function triplets(values: Float64Array, window: number, subset?: readonly number[]): Triplet[] {
  const idx = subset ?? [...values.keys()];
  const out: Triplet[] = [];
  for (let u = 0; u < idx.length; u++) {
    for (let v = u + 1; v < Math.min(idx.length, u + 1 + window); v++) {
      for (let w = v + 1; w < Math.min(idx.length, u + 1 + window); w++) {
        const a = idx[u], b = idx[v], c = idx[w];
        const span = values[c] - values[a];
        if (span <= 0) continue;
        out.push({ a, b, c, ratio: (values[b] - values[a]) / span });
      }
    }
  }
  return out;
}

/**
 * Largest relative change of the dispersion over the detector that the pattern search
 * allows for (0.3 = 30 %): it widens the neighbour-confirmation tolerance by 0.15·u²/N
 * pixels at a distance u from the triplet (the departure of a parabola from its tangent).
 * (Widening the triplet-ratio tolerance too let random matches crowd out the true ones
 * for sparse lamps such as helium, so the ratio tolerance stays at 0.005.) Grating
 * spectrographs change their dispersion by 5–20 % across the sensor (cos β and the
 * projection onto a flat sensor; e.g. d cos³β/(mL) for a transmission grating), so 30 %
 * covers them with a margin (our own choice).
 */
export const CURVATURE_ALLOWANCE = 0.3;

/** Minimum number of matched lines for identification to report success. */
export const MIN_IDENTIFIED_LINES = 4;

/**
 * Identifies measured lines with the lines of a list, with a hint or blind (see the
 * module's description for the method: triplet-ratio matching, voting for dispersion and
 * offset, verification by growth).
 *
 * @param peaks measured lines (any order; spurious peaks and missing lines are tolerated).
 * @param options the list, an optional hint, the detector's pixel domain, the solution order.
 * @returns the matches (peak index → reference line), the map found and statistics;
 *   `ok: false` with `reason` `too-few-peaks` (fewer than 4 peaks) or `no-pattern`.
 * @throws {UsageError} for a malformed hint or dispersion range.
 * @example
 * const r = identifyLampLines(peaks, { list: lampLineList('neon'), hint: { kind: 'range', minWavelengthAngstrom: 5800, maxWavelengthAngstrom: 6700 } });
 * r.matches.length; // lines identified
 */
export function identifyLampLines(peaks: readonly MeasuredPeak[], options: LampIdentifyOptions): LampIdentifyResult {
  const order = options.order ?? 3;
  const empty = (reason: IdentifyFailure, mode: 'hinted' | 'blind', votes = 0, seeds = 0): LampIdentifyResult => ({
    ok: false, reason, mode, matches: [], model: null, rmsPixels: NaN, referenceLines: [], statistics: { votes, seedsGrown: seeds },
  });
  const mode = options.hint ? 'hinted' : 'blind';
  const usable = peaks.map((p, i) => ({ p, i })).filter(({ p }) => Number.isFinite(p.pixel)).sort((x, y) => x.p.pixel - y.p.pixel);
  if (usable.length < MIN_IDENTIFIED_LINES) return empty('too-few-peaks', mode);
  const px = Float64Array.from(usable, (u) => u.p.pixel);
  const sig = Float64Array.from(usable, (u) => (u.p.pixelUncertainty > 0 ? u.p.pixelUncertainty : NaN));
  const strength = usable.map((u) => u.p.strength);
  const domain: Domain = options.domain ?? (() => {
    const pad = 0.01 * (px[px.length - 1] - px[0]) + 1;
    return { min: px[0] - pad, max: px[px.length - 1] + pad };
  })();
  if (!(domain.max > domain.min)) throw new UsageError('calibrate.bad-domain', `the pixel domain must have max > min, got ${domain.min} to ${domain.max}`);
  const nPix = domain.max - domain.min;
  const hint = options.hint ? hintModel(options.hint, domain) : null;
  const [dMin, dMax] = options.dispersionRangeAngstromPerPixel ?? [0.01, 200];
  if (!(dMin > 0 && dMax > dMin)) throw new UsageError('calibrate.bad-dispersion-range', `the dispersion range must have 0 < min < max, got ${dMin} to ${dMax}`);
  let sign: 1 | -1 | 0 = options.direction === 'increasing' ? 1 : options.direction === 'decreasing' ? -1 : 0;
  if (hint) sign = hint.slope((domain.min + domain.max) / 2) > 0 ? 1 : -1;

  // Reference list: restricted to the hinted range (with margins) when there is a hint.
  let list = options.list;
  if (hint) {
    const ends = [hint.at(domain.min), hint.at(domain.max)];
    const lo = Math.min(...ends) - 2 * hint.accuracy, hi = Math.max(...ends) + 2 * hint.accuracy;
    list = { ...list, entries: list.entries.filter((e) => e.wavelengthAngstrom >= lo && e.wavelengthAngstrom <= hi) };
  }
  const sigKnown = [...sig].filter((s) => Number.isFinite(s));
  const medSig = sigKnown.length ? median(sigKnown) : 0.1;
  const fwhms = usable.map((u) => u.p.fwhmPixels).filter((f): f is number => f !== undefined && f > 0);
  const fwhmPx = fwhms.length ? median(fwhms) : 2.5;
  const minTolPx = Math.max(0.5, 4 * medSig);

  // Triplets of the peaks (all peaks) and of the list (raw, unmerged: merging depends on D).
  const raw = mergeUnresolvedLines(list, 0);
  if (raw.length < 3) return empty('no-pattern', mode);
  const rawW = Float64Array.from(raw, (r) => r.wavelengthAngstrom);
  const rawI = raw.map((r) => r.relativeIntensity ?? 0);
  const byIntensity = [...rawI].sort((a, b) => a - b);
  const levels = [0, 1 / 2, 2 / 3, 5 / 6].map((q) => byIntensity[Math.floor(q * byIntensity.length)]);
  const listTriplets: Triplet[] = [];
  const seen = new Set<number>();
  const nr = raw.length;
  for (const level of levels) {
    const subset = [...rawW.keys()].filter((k) => rawI[k] >= level);
    for (const t of triplets(rawW, 6, subset)) {
      if (t.ratio < 0.02 || t.ratio > 0.98) continue; // near-coincident list lines: never resolved
      const key = (t.a * nr + t.b) * nr + t.c;
      if (seen.has(key)) continue;
      seen.add(key);
      listTriplets.push(t);
    }
  }
  listTriplets.sort((x, y) => x.ratio - y.ratio);
  const listRatios = Float64Array.from(listTriplets, (t) => t.ratio);
  // Peak triplets: among all peaks, and among the brighter half (so that faint spurious peaks do not break the pattern).
  const peakTriplets = triplets(px, 4);
  {
    const byStrength = [...strength].sort((a, b) => a - b);
    const cut = byStrength[Math.floor(byStrength.length / 2)];
    const seenP = new Set(peakTriplets.map((t) => (t.a * px.length + t.b) * px.length + t.c));
    for (const t of triplets(px, 4, [...px.keys()].filter((k) => strength[k] >= cut))) {
      if (!seenP.has((t.a * px.length + t.b) * px.length + t.c)) peakTriplets.push(t);
    }
  }

  // Voting.
  const binPx = nPix / 25;
  const mid = (domain.min + domain.max) / 2;
  interface Seed { t: Triplet; L: Triplet; d: number; s: number; weight: number }
  interface Bin { votes: number; iD: number; iL: number; dir: number; seeds: Seed[]; last: number }
  const SEEDS_KEPT = 12;
  /** Bins by dispersion step and direction (index (iD + D_OFFSET)·2 + dirBit), then by wavelength step (small integers). */
  const D_OFFSET = 1000;
  /** Bin width in ln |D|. */
  const D_BIN = 0.04;
  const binsByD = new Map<number, Map<number, Bin>>();
  const allBins: Bin[] = [];
  const getBins = (iD: number, dir: number) => binsByD.get((iD + D_OFFSET) * 2 + (dir > 0 ? 1 : 0));
  let votes = 0;
  const needConfirm = px.length >= 20 ? 2 : 1;
  for (const [ti, t] of peakTriplets.entries()) {
    const span = px[t.c] - px[t.a];
    if (span < 3) continue;
    const sr = Math.sqrt(3) * (Number.isFinite(sig[t.b]) ? Math.max(sig[t.a], sig[t.b], sig[t.c]) : medSig) / span;
    // Ratio tolerance: 0.005 (the local change of dispersion within a triplet of neighbours) and the centres' errors.
    const tol = 0.005 + 3 * sr;
    const w = strength[t.a] + strength[t.b] + strength[t.c];
    for (const dir of sign === 0 ? [1, -1] : [sign]) {
      const target = dir > 0 ? t.ratio : 1 - t.ratio;
      for (let k = lowerBound(listRatios, target - tol); k < listTriplets.length && listRatios[k] <= target + tol; k++) {
        const L = listTriplets[k];
        const D = (dir * (rawW[L.c] - rawW[L.a])) / span;
        const aD = Math.abs(D);
        if (aD < dMin || aD > dMax) continue;
        const lamB = rawW[L.b];
        if (hint) {
          const hd = hint.slope(px[t.b]);
          if (Math.abs(lamB - hint.at(px[t.b])) > hint.accuracy || Math.abs(D / hd - 1) > hint.dispTol) continue;
        }
        // Confirmation by the neighbours: of the two peaks beyond each end of the
        // triplet, enough must fall on list lines where this map predicts them.
        let confirmed = 0, available = 0;
        for (const e of [t.a - 2, t.a - 1, t.c + 1, t.c + 2]) {
          if (e < 0 || e >= px.length || e === t.b) continue;
          available++;
          const pred = lamB + D * (px[e] - px[t.b]);
          const u = Math.abs(px[e] - px[t.b]);
          const tolA = aD * (Math.max(1, 0.01 * u) + (0.5 * CURVATURE_ALLOWANCE * u * u) / nPix);
          const q = lowerBound(rawW, pred - tolA);
          if (q < rawW.length && rawW[q] <= pred + tolA) confirmed++;
        }
        if (confirmed < Math.min(needConfirm, available)) continue;
        const lamMid = lamB + D * (mid - px[t.b]);
        const iD = Math.round(Math.log(aD) / D_BIN);
        const iL = Math.round(lamMid / (aD * binPx));
        let byL = getBins(iD, D);
        if (!byL) { byL = new Map(); binsByD.set((iD + D_OFFSET) * 2 + (D > 0 ? 1 : 0), byL); }
        let bin = byL.get(iL);
        if (!bin) { bin = { votes: 0, iD, iL, dir: D > 0 ? 1 : -1, seeds: [], last: -1 }; byL.set(iL, bin); allBins.push(bin); }
        // One vote per peak triplet and bin: at large dispersions one triplet matches many list triplets of one bin.
        if (bin.last !== ti) { bin.votes++; bin.last = ti; }
        if (bin.seeds.length < SEEDS_KEPT) bin.seeds.push({ t, L, d: D, s: iD, weight: w });
        else {
          let low = 0;
          for (let q = 1; q < SEEDS_KEPT; q++) if (bin.seeds[q].weight < bin.seeds[low].weight) low = q;
          if (w > bin.seeds[low].weight) bin.seeds[low] = { t, L, d: D, s: iD, weight: w };
        }
        votes++;
      }
    }
  }
  if (allBins.length === 0) return empty('no-pattern', mode, votes);

  // Rank bins by the excess of their votes (with their neighbours', 3 × 3 bins) over the
  // background of their rows of dispersion (random coincidences pile up at large
  // dispersions, where a bin spans more wavelength): (n − e)/(e + 5), e the rows' mean
  // count per bin over the range they occupy, for 9 bins.
  const rowMean = new Map<number, number>();
  for (const [k, byL] of binsByD) {
    let v = 0, lo = Infinity, hi = -Infinity;
    for (const [iL, b] of byL) { v += b.votes; lo = Math.min(lo, iL); hi = Math.max(hi, iL); }
    rowMean.set(k, v / (hi - lo + 1));
  }
  const ranked: { score: number; bin: Bin }[] = [];
  for (const bin of allBins) {
    if (bin.votes < 2) continue;
    let n = 0, e = 0;
    for (let a = -1; a <= 1; a++) {
      const byL = getBins(bin.iD + a, bin.dir);
      if (!byL) continue;
      e += 3 * (rowMean.get((bin.iD + a + D_OFFSET) * 2 + (bin.dir > 0 ? 1 : 0)) ?? 0);
      for (let b = -1; b <= 1; b++) n += byL.get(bin.iL + b)?.votes ?? 0;
    }
    ranked.push({ score: (n - e) / (e + 5), bin });
  }
  if (ranked.length === 0) for (const bin of allBins) ranked.push({ score: bin.votes, bin });
  ranked.sort((x, y) => y.score - x.score || y.bin.votes - x.bin.votes);

  const MAX_BINS = 15;
  const SEEDS_PER_BIN = 6;
  let best: Candidate | null = null;
  let bestRef: LampReferenceLine[] = [];
  let seedsGrown = 0;
  const refCache = new Map<number, { ref: LampReferenceLine[]; map: Int32Array }>();
  // The best-ranked bins first; while no candidate explains half of the peaks, up to four times as many.
  for (const [rank, { bin }] of ranked.slice(0, 4 * MAX_BINS).entries()) {
    const sofar = best as Candidate | null;
    if (rank >= MAX_BINS && sofar && sofar.count >= 0.5 * px.length) break;
    const seeds = [...bin.seeds].sort((x, y) => y.weight - x.weight).slice(0, SEEDS_PER_BIN);
    for (const seed of seeds) {
      // Reference lines merged at this candidate's resolution (cached per step of D).
      let cached = refCache.get(seed.s);
      if (!cached) {
        const ref = mergeUnresolvedLines(list, fwhmPx * Math.abs(seed.d));
        const map = new Int32Array(raw.length);
        let j = 0;
        for (let k = 0; k < raw.length; k++) {
          while (j < ref.length - 1 && Math.abs(ref[j + 1].wavelengthAngstrom - rawW[k]) < Math.abs(ref[j].wavelengthAngstrom - rawW[k])) j++;
          map[k] = j;
        }
        cached = { ref, map };
        refCache.set(seed.s, cached);
      }
      const { ref, map } = cached;
      const { t, L } = seed;
      const pairs = seed.d > 0 ? [[t.a, L.a], [t.b, L.b], [t.c, L.c]] : [[t.a, L.c], [t.b, L.b], [t.c, L.a]];
      const seedPairs = pairs.map(([i, k]) => [i, map[k]] as const);
      if (new Set(seedPairs.map((p) => p[1])).size < 3) continue;
      const ctx: Context = {
        px, sig, ref,
        refW: Float64Array.from(ref, (r) => r.wavelengthAngstrom),
        refI: Float64Array.from(ref, (r) => r.relativeIntensity ?? 0),
        domain, maxGrowOrder: Math.max(3, order), minTolPx, sign: sign === 0 ? (seed.d > 0 ? 1 : -1) : sign,
      };
      const c = grow(ctx, seedPairs);
      seedsGrown++;
      if (c && (!best || c.count > best.count || (c.count === best.count && c.rmsPx < best.rmsPx))) {
        best = c;
        bestRef = ref;
      }
    }
    if (best && best.count >= 0.9 * px.length && best.rmsPx < 0.3) break;
  }
  if (!best || best.count < MIN_IDENTIFIED_LINES) return empty('no-pattern', mode, votes, seedsGrown);
  const matches: LineMatch[] = [];
  for (let i = 0; i < px.length; i++) if (best.matched[i] >= 0) matches.push({ peakIndex: usable[i].i, line: bestRef[best.matched[i]] });
  return {
    ok: true,
    reason: null,
    mode,
    matches,
    model: { coefficients: [...best.coefficients], order: best.order, domain },
    rmsPixels: best.rmsPx,
    referenceLines: bestRef,
    statistics: { votes, seedsGrown },
  };
}
