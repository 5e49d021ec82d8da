/**
 * The generalised Lomb–Scargle periodogram of a velocity series, its false-alarm
 * probability, the spectral window, and the aliases of the best peak.
 *
 * Method: Zechmeister & Kürster 2009 (A&A 496, 577), eqs. 4–15: at each trial frequency a
 * sinusoid plus a constant (floating mean) is fitted by weighted least squares with
 * weights 1/σ²; the "standard" power p = 1 − χ²(f)/χ²₀ ∈ [0, 1] is the fraction of the
 * weighted variance about the weighted mean that the sinusoid explains. Other
 * normalisations are monotonic functions of it: `model` = p/(1 − p), `log` = −ln(1 − p),
 * `psd` = χ²₀ p / 2 (the same definitions as astropy's LombScargle, against which the
 * powers are tested).
 *
 * False-alarm probability of the highest peak: Baluev 2008 (MNRAS 385, 1279), the
 * alias-free approximation FAP ≈ 1 − (1 − FAP₁(z)) e^{−τ(z)} built on the Davies bound
 * τ(z) (his eqs. 5–6 and Table 1), for the standard power with N_H = N − 1 and
 * N_K = N − 3 degrees of freedom, effective time span T_eff = √(4π·Var_w(t)) and the
 * highest searched frequency f_max. The Davies upper bound FAP₁ + τ is reported as well.
 *
 * Spectral window: W(f) = |Σ exp(2πi f t_j)|² / N² (Deeming 1975, Ap&SS 36, 137), on the
 * same grid; its strongest peaks f_w (e.g. 1 d⁻¹ from nightly observing, 1 yr⁻¹ from
 * seasons) give the aliases f_best ± f_w of the best peak.
 */
import { InputError, UsageError } from '../errors.js';
import { provenanceEntry, type ProvenanceEntry } from '../spectrum/provenance.js';
import { messages } from './messages.js';
import { lnGamma } from './special.js';
import type { VelocityTable } from './table.js';

/** Power normalisations (all monotonic in the standard power, so the peaks are the same). */
export type PeriodogramNormalization = 'standard' | 'model' | 'log' | 'psd';

/** Periodic sampling patterns recognised among the window peaks. */
export type SamplingCycle = 'day' | 'month' | 'year';

/** Options of {@link velocityPeriodogram}. */
export interface PeriodogramOptions {
  /**
   * Shortest period searched, days. Default 0.5 d (common practice for nightly ground-based
   * sampling: the grid then reaches 2 d⁻¹ and holds the 1 d⁻¹ aliases of periods ≥ 1 d).
   */
  minPeriodDays?: number;
  /** Longest period searched, days. Default: the time span of the data. */
  maxPeriodDays?: number;
  /**
   * Grid points per resolution element 1/T (T = time span). Default 10 (common practice:
   * 5–10 keeps the peak height within a few per cent of its true maximum).
   */
  oversampling?: number;
  /** Power normalisation of `power` and of the peaks' `power`. Default `standard`. */
  normalization?: PeriodogramNormalization;
  /** Number of peaks listed in `peaks`. Default 5. */
  peakCount?: number;
  /** Number of window peaks used for aliases. Default 3. */
  windowPeakCount?: number;
  /** Largest grid allowed (guards against times in seconds). Default 2 000 000. */
  maxFrequencies?: number;
}

const DEFAULTS = {
  minPeriodDays: 0.5,
  oversampling: 10,
  normalization: 'standard' as PeriodogramNormalization,
  peakCount: 5,
  windowPeakCount: 3,
  maxFrequencies: 2_000_000,
};

/** One peak of the periodogram, refined between grid points. */
export interface PeriodogramPeak {
  /** Frequency of the peak, d⁻¹. */
  readonly frequencyPerDay: number;
  /** 1 / frequency, days. */
  readonly periodDays: number;
  /** Power in the periodogram's normalisation. */
  readonly power: number;
  /** Standard power (fraction of variance explained, 0–1). */
  readonly powerStandard: number;
}

/** A peak of the spectral window. */
export interface WindowPeak {
  /** Frequency, d⁻¹. */
  readonly frequencyPerDay: number;
  /** 1 / frequency, days. */
  readonly periodDays: number;
  /** Window power, 0–1. */
  readonly power: number;
  /** The sampling cycle it matches within one resolution element 1/T, or null. */
  readonly cycle: SamplingCycle | null;
}

/** An alias f_best ± f_window of the best peak. */
export interface PeakAlias {
  /** The window peak that makes it. */
  readonly windowFrequencyPerDay: number;
  /** Its sampling cycle, or null. */
  readonly windowCycle: SamplingCycle | null;
  /** +1 for f_best + f_w, −1 for |f_best − f_w|. */
  readonly sign: 1 | -1;
  /** Alias frequency, d⁻¹. */
  readonly frequencyPerDay: number;
  /** Alias period, days. */
  readonly periodDays: number;
  /** Periodogram power at the alias frequency (same normalisation). */
  readonly power: number;
}

/** Result of {@link velocityPeriodogram}. */
export interface Periodogram {
  /** Trial frequencies, d⁻¹, increasing and evenly spaced. */
  readonly frequencyPerDay: Float64Array;
  /** Power at each frequency, in `normalization`. */
  readonly power: Float64Array;
  /** Spectral window at each frequency, 0–1. */
  readonly windowPower: Float64Array;
  /** Normalisation of `power`. */
  readonly normalization: PeriodogramNormalization;
  /** The highest peak, refined between grid points. */
  readonly best: PeriodogramPeak;
  /** The highest local maxima, best first (best included). */
  readonly peaks: readonly PeriodogramPeak[];
  /** Baluev (2008) false-alarm probability of the best peak under white Gaussian noise. */
  readonly falseAlarmProbability: number;
  /** Davies upper bound on that probability (capped at 1). */
  readonly falseAlarmBound: number;
  /** The strongest peaks of the spectral window, strongest first. */
  readonly windowPeaks: readonly WindowPeak[];
  /** Aliases of the best peak inside the searched range. */
  readonly aliases: readonly PeakAlias[];
  /** Number of velocities used. */
  readonly pointCount: number;
  /** Time span of the data, days. */
  readonly timeSpanDays: number;
  /** Searched period range, days. */
  readonly minPeriodDays: number;
  readonly maxPeriodDays: number;
  /** Oversampling used. */
  readonly oversampling: number;
  /** Input provenance plus a `periodogram` entry. */
  readonly provenance: readonly ProvenanceEntry[];
}

/** Weighted sums of one series, precomputed once. */
interface Series {
  /** Times minus their weighted mean, days. */
  tau: Float64Array;
  /** Values minus their weighted mean. */
  y: Float64Array;
  /** Normalised weights (sum 1). */
  w: Float64Array;
  /** Σ w y² (of centred y). */
  yy: number;
  /** Unnormalised χ² of the constant model, Σ (y − ȳ)²/σ². */
  chi2Ref: number;
}

function prepare(t: ArrayLike<number>, y: ArrayLike<number>, dy: ArrayLike<number>): Series {
  const n = t.length;
  const w = new Float64Array(n);
  let W = 0;
  for (let i = 0; i < n; i++) W += w[i] = 1 / (dy[i] * dy[i]);
  let tm = 0;
  let ym = 0;
  for (let i = 0; i < n; i++) {
    w[i] /= W;
    tm += w[i] * t[i];
    ym += w[i] * y[i];
  }
  const tau = new Float64Array(n);
  const yc = new Float64Array(n);
  let yy = 0;
  for (let i = 0; i < n; i++) {
    tau[i] = t[i] - tm;
    yc[i] = y[i] - ym;
    yy += w[i] * yc[i] * yc[i];
  }
  return { tau, y: yc, w, yy, chi2Ref: yy * W };
}

/** Standard power from the weighted sums (ZK09 eqs. 5–13); handles the degenerate case. */
function powerFromSums(s: Series, C: number, S: number, YC: number, YS: number, CCraw: number, CSraw: number): number {
  if (!(s.yy > 0)) return 0;
  const CC = CCraw - C * C;
  const SS = 1 - CCraw - S * S;
  const CS = CSraw - C * S;
  const D = CC * SS - CS * CS;
  let p: number;
  if (D > 1e-12 * (CC + SS) * (CC + SS)) {
    p = (SS * YC * YC + CC * YS * YS - 2 * CS * YC * YS) / (s.yy * D);
  } else if (CC + SS > 0) {
    // cos and sin columns are (nearly) parallel: project on their common direction.
    p = (YC * YC + YS * YS) / ((CC + SS) * s.yy);
  } else {
    p = 0;
  }
  return Math.min(1, Math.max(0, p));
}

/** Standard power at one frequency, computed directly. */
function powerAt(s: Series, f: number): number {
  let C = 0, S = 0, YC = 0, YS = 0, CC = 0, CS = 0;
  const omega = 2 * Math.PI * f;
  for (let i = 0; i < s.tau.length; i++) {
    const x = omega * s.tau[i];
    const c = Math.cos(x);
    const sn = Math.sin(x);
    const w = s.w[i];
    C += w * c; S += w * sn;
    YC += w * s.y[i] * c; YS += w * s.y[i] * sn;
    CC += w * c * c; CS += w * c * sn;
  }
  return powerFromSums(s, C, S, YC, YS, CC, CS);
}

function normalize(p: number, how: PeriodogramNormalization, chi2Ref: number): number {
  switch (how) {
    case 'standard': return p;
    case 'model': return p / (1 - p);
    case 'log': return -Math.log1p(-p);
    case 'psd': return 0.5 * chi2Ref * p;
  }
}

/** Standard power and spectral window over an evenly spaced grid, by angle-addition recurrences re-seeded every 64 steps. */
function gridPowers(s: Series, f0: number, df: number, count: number): { power: Float64Array; window: Float64Array } {
  const n = s.tau.length;
  const power = new Float64Array(count);
  const window = new Float64Array(count);
  const c = new Float64Array(n), sn = new Float64Array(n), cd = new Float64Array(n), sd = new Float64Array(n);
  for (let i = 0; i < n; i++) {
    cd[i] = Math.cos(2 * Math.PI * df * s.tau[i]);
    sd[i] = Math.sin(2 * Math.PI * df * s.tau[i]);
  }
  for (let k = 0; k < count; k++) {
    if (k % 64 === 0) {
      const omega = 2 * Math.PI * (f0 + k * df);
      for (let i = 0; i < n; i++) {
        c[i] = Math.cos(omega * s.tau[i]);
        sn[i] = Math.sin(omega * s.tau[i]);
      }
    }
    let C = 0, S = 0, YC = 0, YS = 0, CC = 0, CS = 0, WC = 0, WS = 0;
    for (let i = 0; i < n; i++) {
      const ci = c[i], si = sn[i], w = s.w[i], wy = w * s.y[i];
      C += w * ci; S += w * si;
      YC += wy * ci; YS += wy * si;
      CC += w * ci * ci; CS += w * ci * si;
      WC += ci; WS += si;
      c[i] = ci * cd[i] - si * sd[i];
      sn[i] = si * cd[i] + ci * sd[i];
    }
    power[k] = powerFromSums(s, C, S, YC, YS, CC, CS);
    window[k] = (WC * WC + WS * WS) / (n * n);
  }
  return { power, window };
}

/** Golden-section search for the maximum of the standard power in [a, b]. */
function refinePeak(s: Series, a: number, b: number): { f: number; p: number } {
  const g = (Math.sqrt(5) - 1) / 2;
  let x1 = b - g * (b - a), x2 = a + g * (b - a);
  let p1 = powerAt(s, x1), p2 = powerAt(s, x2);
  for (let it = 0; it < 40; it++) {
    if (p1 < p2) { a = x1; x1 = x2; p1 = p2; x2 = a + g * (b - a); p2 = powerAt(s, x2); }
    else { b = x2; x2 = x1; p2 = p1; x1 = b - g * (b - a); p1 = powerAt(s, x1); }
  }
  return p1 > p2 ? { f: x1, p: p1 } : { f: x2, p: p2 };
}

function localMaxima(a: Float64Array): number[] {
  const out: number[] = [];
  for (let k = 1; k < a.length - 1; k++) if (a[k] > a[k - 1] && a[k] >= a[k + 1]) out.push(k);
  return out.sort((i, j) => a[j] - a[i]);
}

/**
 * Generalised Lomb–Scargle power at given frequencies.
 *
 * Method: Zechmeister & Kürster 2009 (A&A 496, 577), floating mean, weights 1/σ²; see the
 * module comment for the normalisations.
 *
 * @param timeDays observation times, days (any zero point; at least 4 values, not all equal).
 * @param value measured values (e.g. km/s), same length.
 * @param uncertainty 1-σ uncertainties, positive, same length.
 * @param frequencyPerDay trial frequencies, d⁻¹ (any order, any spacing).
 * @param normalization power normalisation. Default `standard`.
 * @returns the power at each frequency.
 * @throws {InputError} when lengths differ, fewer than 4 points are given, the times span zero, or an uncertainty is not positive.
 * @example
 * const p = lombScarglePower([0, 0.3, 1.1, 1.7, 2.2], [1, -0.8, 0.6, -0.9, 0.95], [0.1, 0.1, 0.1, 0.1, 0.1], [0.5, 1]);
 */
export function lombScarglePower(
  timeDays: ArrayLike<number>,
  value: ArrayLike<number>,
  uncertainty: ArrayLike<number>,
  frequencyPerDay: ArrayLike<number>,
  normalization: PeriodogramNormalization = DEFAULTS.normalization,
): Float64Array {
  checkSeries(timeDays, value, uncertainty);
  const s = prepare(timeDays, value, uncertainty);
  const out = new Float64Array(frequencyPerDay.length);
  for (let k = 0; k < out.length; k++) out[k] = normalize(powerAt(s, frequencyPerDay[k]), normalization, s.chi2Ref);
  return out;
}

function checkSeries(t: ArrayLike<number>, y: ArrayLike<number>, dy: ArrayLike<number>): void {
  const n = t.length;
  if (y.length !== n) throw new InputError('orbit.length-mismatch', messages.lengthMismatch('the values', y.length, n));
  if (dy.length !== n) throw new InputError('orbit.length-mismatch', messages.lengthMismatch('the uncertainties', dy.length, n));
  if (n < 4) throw new InputError('orbit.too-few-points', messages.tooFewPoints(n, 4, 'a periodogram'));
  let lo = Infinity, hi = -Infinity;
  for (let i = 0; i < n; i++) {
    if (!Number.isFinite(t[i])) throw new InputError('orbit.table-not-finite', messages.tableNotFinite(t[i]), { index: i, column: 'time' });
    if (!Number.isFinite(y[i])) throw new InputError('orbit.table-not-finite', messages.tableNotFinite(y[i]), { index: i, column: 'value' });
    if (!(dy[i] > 0 && Number.isFinite(dy[i]))) throw new InputError('orbit.table-bad-uncertainty', messages.tableBadUncertainty(dy[i]), { index: i, column: 'uncertainty' });
    lo = Math.min(lo, t[i]); hi = Math.max(hi, t[i]);
  }
  if (!(hi > lo)) throw new InputError('orbit.zero-span', messages.zeroSpan());
}

/**
 * False-alarm probability of a periodogram peak of standard power z, for white Gaussian
 * noise, searching frequencies up to f_max.
 *
 * Method: Baluev 2008 (MNRAS 385, 1279), eqs. 5–6 and Table 1 for the "standard" power
 * (floating mean, N_H = N − 1, N_K = N − 3): FAP₁ = (1 − z)^{N_K/2},
 * τ = γ(N_H) W (1 − z)^{(N_K − 1)/2} √(N_H z / 2) with W = f_max √(4π Var_w(t)) and
 * γ(N) = √(2/N) Γ(N/2)/Γ((N − 1)/2); the alias-free value is 1 − (1 − FAP₁) e^{−τ} and the
 * Davies bound FAP₁ + τ.
 *
 * @param powerStandard z, the standard power of the peak, 0 ≤ z ≤ 1.
 * @param timeDays observation times, days (at least 4).
 * @param uncertainty 1-σ uncertainties (they weight the time variance).
 * @param maxFrequencyPerDay f_max, the highest frequency searched, d⁻¹.
 * @returns `{ baluev, davies }`: the approximation and the upper bound (capped at 1).
 * @throws {InputError} as {@link lombScarglePower}.
 * @example
 * baluevFalseAlarmProbability(0.6, times, sigmas, 2).baluev; // e.g. 1e-3
 */
export function baluevFalseAlarmProbability(
  powerStandard: number,
  timeDays: ArrayLike<number>,
  uncertainty: ArrayLike<number>,
  maxFrequencyPerDay: number,
): { baluev: number; davies: number } {
  checkSeries(timeDays, timeDays, uncertainty);
  const n = timeDays.length;
  const z = Math.min(1, Math.max(0, powerStandard));
  let W = 0, tm = 0;
  for (let i = 0; i < n; i++) { const w = 1 / (uncertainty[i] * uncertainty[i]); W += w; tm += w * timeDays[i]; }
  tm /= W;
  let varT = 0;
  for (let i = 0; i < n; i++) { const d = timeDays[i] - tm; varT += d * d / (uncertainty[i] * uncertainty[i]); }
  varT /= W;
  const NH = n - 1;
  const NK = n - 3;
  const gamma = Math.sqrt(2 / NH) * Math.exp(lnGamma(NH / 2) - lnGamma((NH - 1) / 2));
  const Weff = maxFrequencyPerDay * Math.sqrt(4 * Math.PI * varT);
  const fapSingle = Math.pow(1 - z, 0.5 * NK);
  const tau = gamma * Weff * Math.pow(1 - z, 0.5 * (NK - 1)) * Math.sqrt(0.5 * NH * z);
  return { baluev: -Math.expm1(-tau) + fapSingle * Math.exp(-tau), davies: Math.min(1, fapSingle + tau) };
}

/** Frequencies of known sampling cycles, d⁻¹. */
const CYCLES: readonly [SamplingCycle, number][] = [
  ['day', 1], // solar day
  ['day', 1.00273790935], // sidereal day (IAU 1982 ratio of mean sidereal to solar time, from memory)
  ['month', 1 / 29.530589], // synodic month, days (from memory): bright-moon gaps
  ['year', 1 / 365.25], // Julian year, days
];

function cycleOf(f: number, resolution: number): SamplingCycle | null {
  for (const [name, fc] of CYCLES) if (Math.abs(f - fc) <= resolution) return name;
  return null;
}

/**
 * Generalised Lomb–Scargle periodogram of the (primary) velocities of a table, with the
 * false-alarm probability of its highest peak, the spectral window and the aliases.
 *
 * Method: Zechmeister & Kürster 2009 on an evenly spaced frequency grid from 1/maxPeriod to
 * 1/minPeriod with step 1/(oversampling·T), T the time span; peaks refined between grid
 * points by golden-section search; FAP by Baluev 2008 (see {@link baluevFalseAlarmProbability});
 * spectral window after Deeming 1975; aliases f_best ± f_w for the strongest window peaks.
 *
 * @param table velocities (at least 4 rows, times not all equal). Only the first star's
 *   velocities are used.
 * @param options period range, oversampling, normalisation (see {@link PeriodogramOptions}).
 * @returns the periodogram; `falseAlarmProbability` near 0 means the best peak is unlikely to be noise.
 * @throws {InputError} for fewer than 4 rows, zero time span, or a grid larger than `maxFrequencies`.
 * @throws {UsageError} for an empty or inverted period range or a bad option value.
 * @example
 * const pg = velocityPeriodogram(readVelocityTable('lvac7-velocities.csv'), { minPeriodDays: 1 });
 * pg.best.periodDays; // the strongest period, days
 */
export function velocityPeriodogram(table: VelocityTable, options: PeriodogramOptions = {}): Periodogram {
  const t = table.bjdTdb;
  checkSeries(t, table.velocityKmPerS, table.uncertaintyKmPerS);
  const n = t.length;
  let lo = Infinity, hi = -Infinity;
  for (let i = 0; i < n; i++) { lo = Math.min(lo, t[i]); hi = Math.max(hi, t[i]); }
  const span = hi - lo;
  const minP = options.minPeriodDays ?? DEFAULTS.minPeriodDays;
  const maxP = options.maxPeriodDays ?? span;
  const over = options.oversampling ?? DEFAULTS.oversampling;
  const normalization = options.normalization ?? DEFAULTS.normalization;
  const peakCount = options.peakCount ?? DEFAULTS.peakCount;
  const windowPeakCount = options.windowPeakCount ?? DEFAULTS.windowPeakCount;
  const maxFrequencies = options.maxFrequencies ?? DEFAULTS.maxFrequencies;
  if (!(over >= 1 && Number.isFinite(over))) throw new UsageError('orbit.bad-option', messages.badOption('oversampling', over, 'a number ≥ 1'));
  if (!['standard', 'model', 'log', 'psd'].includes(normalization)) throw new UsageError('orbit.bad-option', messages.badOption('normalization', normalization, 'standard, model, log or psd'));
  for (const [name, v] of [['peakCount', peakCount], ['windowPeakCount', windowPeakCount], ['maxFrequencies', maxFrequencies]] as const) {
    if (!(Number.isInteger(v) && v >= 1)) throw new UsageError('orbit.bad-option', messages.badOption(name, v, 'a positive integer'));
  }
  if (!(minP > 0 && Number.isFinite(minP) && maxP > minP && Number.isFinite(maxP))) throw new UsageError('orbit.period-range', messages.periodRange(minP, maxP));
  const fMin = 1 / maxP;
  const fMax = 1 / minP;
  const df = 1 / (over * span);
  const countEstimate = Math.floor((fMax - fMin) / df) + 1;
  if (countEstimate > maxFrequencies) throw new InputError('orbit.grid-too-large', messages.gridTooLarge(countEstimate, maxFrequencies, span, minP));
  const count = Math.max(3, countEstimate);
  const step = countEstimate >= 3 ? df : (fMax - fMin) / 2;

  const s = prepare(t, table.velocityKmPerS, table.uncertaintyKmPerS);
  const { power: pStd, window } = gridPowers(s, fMin, step, count);
  const freq = new Float64Array(count);
  for (let k = 0; k < count; k++) freq[k] = fMin + k * step;
  const power = normalization === 'standard' ? pStd : pStd.map((p) => normalize(p, normalization, s.chi2Ref));

  const peak = (f: number, p: number): PeriodogramPeak => ({ frequencyPerDay: f, periodDays: 1 / f, power: normalize(p, normalization, s.chi2Ref), powerStandard: p });
  const maxima = localMaxima(pStd);
  // The edges of the grid count as peaks when the power rises towards them.
  let kBest = 0;
  for (let k = 1; k < count; k++) if (pStd[k] > pStd[kBest]) kBest = k;
  if (!maxima.includes(kBest)) maxima.unshift(kBest);
  const peaks = maxima.slice(0, peakCount).map((k) => {
    const r = refinePeak(s, freq[Math.max(0, k - 1)], freq[Math.min(count - 1, k + 1)]);
    return r.p >= pStd[k] ? peak(r.f, r.p) : peak(freq[k], pStd[k]);
  }).sort((a, b) => b.powerStandard - a.powerStandard);
  const best = peaks[0];
  const fap = baluevFalseAlarmProbability(best.powerStandard, t, table.uncertaintyKmPerS, fMax);

  const resolution = 1 / span;
  const windowPeaks: WindowPeak[] = localMaxima(window).slice(0, windowPeakCount).map((k) => ({
    frequencyPerDay: freq[k], periodDays: 1 / freq[k], power: window[k], cycle: cycleOf(freq[k], resolution),
  }));
  const aliases: PeakAlias[] = [];
  for (const wp of windowPeaks) {
    for (const sign of [1, -1] as const) {
      const f = Math.abs(best.frequencyPerDay + sign * wp.frequencyPerDay);
      if (f < fMin || f > fMax || Math.abs(f - best.frequencyPerDay) < resolution) continue;
      aliases.push({
        windowFrequencyPerDay: wp.frequencyPerDay, windowCycle: wp.cycle, sign, frequencyPerDay: f, periodDays: 1 / f,
        power: normalize(powerAt(s, f), normalization, s.chi2Ref),
      });
    }
  }
  const parameters = { minPeriodDays: minP, maxPeriodDays: maxP, oversampling: over, normalization, frequencies: count, points: n, method: 'generalised Lomb-Scargle (Zechmeister & Kuerster 2009)', falseAlarm: 'Baluev 2008' };
  return Object.freeze({
    frequencyPerDay: freq, power, windowPower: window, normalization,
    best, peaks: Object.freeze(peaks),
    falseAlarmProbability: fap.baluev, falseAlarmBound: fap.davies,
    windowPeaks: Object.freeze(windowPeaks), aliases: Object.freeze(aliases),
    pointCount: n, timeSpanDays: span, minPeriodDays: minP, maxPeriodDays: maxP, oversampling: over,
    provenance: Object.freeze([...table.provenance, provenanceEntry('periodogram', parameters)]),
  });
}
