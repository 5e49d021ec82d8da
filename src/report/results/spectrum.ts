/**
 * Summaries of a spectrum and of a continuum fit.
 */
import type { ContinuumResult } from '../../lines/continuum.js';
import { derSnr } from '../../lines/snr.js';
import { isUsablePixel, type Spectrum } from '../../spectrum/spectrum.js';
import { unitLabel } from '../../spectrum/units.js';
import { formatNumber, formatSignificant, observationLabel } from '../format.js';
import type { Table } from '../table.js';
import { plural, type ResultContext, type ResultSummary } from './summary.js';

/** `Å (air)`, `nm (vacuum)`, `Å (medium not stated)`, `pixels`. */
function axisUnit(spectrum: Spectrum): string {
  if (spectrum.unit === 'pixel') return 'pixels';
  const medium = spectrum.medium ?? 'medium not stated';
  return `${unitLabel(spectrum.unit)} (${medium})`;
}

/**
 * A spectrum for people: object and date from the header, pixel count, range and unit of
 * the axis with the medium, flux unit, usable pixels, and the DER_SNR signal-to-noise
 * ratio (Stoehr et al. 2008) of the usable flux.
 *
 * @param spectrum any spectrum; not modified.
 * @returns title, sentences and a table of quantities.
 * @example summarizeSpectrum(readSpectrum('lvac7-star.fits')).title; // 'Spectrum: LVAC-7, 2026-05-14 03:12:45 UTC'
 */
export function summarizeSpectrum(spectrum: Spectrum): ResultSummary {
  const n = spectrum.flux.length;
  const usable: number[] = [];
  for (let i = 0; i < n; i++) if (isUsablePixel(spectrum, i)) usable.push(spectrum.flux[i]);
  const first = spectrum.wavelength[0];
  const last = spectrum.wavelength[n - 1];
  const decimals = spectrum.unit === 'pixel' ? 0 : 2;
  const snr = derSnr(usable).snr;
  const fluxUnit = spectrum.fluxUnit?.trim() || 'arbitrary units';
  const label = observationLabel(spectrum);
  const lines = [
    `${plural(n, 'pixel')} (${usable.length} usable) from ${formatNumber(first, decimals)} to ${formatNumber(last, decimals)} ${axisUnit(spectrum)}; flux in ${fluxUnit}${spectrum.uncertainty ? ', with uncertainties' : ', no uncertainties'}.`,
    `Signal-to-noise ratio (DER_SNR): ${Number.isFinite(snr) ? formatSignificant(snr, 3) : 'n/a'}.`,
  ];
  if (spectrum.unit === 'pixel') lines.push('Not wavelength-calibrated: the axis is in pixels.');
  const table: Table = {
    caption: 'Spectrum',
    columns: [{ key: 'quantity', label: 'Quantity' }, { key: 'value', label: 'Value' }],
    rows: [
      ...(label ? [{ quantity: 'Observation', value: label }] : []),
      { quantity: 'Pixels (usable)', value: `${n} (${usable.length})` },
      { quantity: 'Axis', value: `${formatNumber(first, decimals)} to ${formatNumber(last, decimals)} ${axisUnit(spectrum)}` },
      { quantity: 'Flux unit', value: fluxUnit },
      { quantity: 'Uncertainties', value: spectrum.uncertainty ? 'yes' : 'no' },
      { quantity: 'S/N (DER_SNR)', value: Number.isFinite(snr) ? formatSignificant(snr, 3) : 'n/a' },
      ...(spectrum.source ? [{ quantity: 'File', value: spectrum.source.file }] : []),
    ],
  };
  return { title: label ? `Spectrum: ${label}` : 'Spectrum', lines, tables: [table] };
}

/**
 * A continuum fit for people: whether the clipping settled, the pixels used and the
 * scatter about the continuum.
 *
 * @param result from `fitContinuum`; not modified.
 * @param context the spectrum it was fitted to (for the title and flux unit).
 * @returns title and sentences (no table).
 * @example summarizeContinuum(fitContinuum(star), { spectrum: star }).lines[0];
 */
export function summarizeContinuum(result: ContinuumResult, context: ResultContext = {}): ResultSummary {
  let used = 0;
  for (const u of result.used) used += u;
  const label = context.spectrum ? observationLabel(context.spectrum) : undefined;
  const unit = context.spectrum?.fluxUnit?.trim() || 'flux units';
  const method = typeof result.parameters.method === 'string' ? `${result.parameters.method} ` : '';
  return {
    title: label ? `Continuum: ${label}` : 'Continuum',
    lines: [
      `${method}continuum ${result.converged ? 'settled' : 'did not settle'} after ${plural(result.iterations, 'round')} of clipping; ${used} of ${result.continuum.length} pixels used.`,
      `Scatter about the continuum (1.4826 × MAD): ${formatSignificant(result.scatter, 3)} ${unit}.`,
    ],
    tables: [],
  };
}

/** Title of a result measured in a spectrum: `What: LVAC-7, 2026-05-14 03:12:45 UTC`. */
export function titleWithObservation(what: string, context: ResultContext): string {
  const label = context.spectrum ? observationLabel(context.spectrum) : undefined;
  return label ? `${what}: ${label}` : what;
}
