/**
 * Summary of an element identification.
 */
import type { SpectrumIdentification } from '../../elements/spectrum.js';
import type { IdentificationResult } from '../../elements/identify.js';
import type { LineIdentification } from '../../elements/types.js';
import { formatNumber, formatProbability, formatSignificant } from '../format.js';
import type { Table, TableCell } from '../table.js';
import { titleWithObservation } from './spectrum.js';
import { capRows, plural, type ResultContext, type ResultSummary } from './summary.js';

/** The best candidate of a found line as `Fe I 5269.54`, or `O2 telluric (A band)`, or ''. */
export function bestCandidateLabel(line: LineIdentification): string {
  const c = line.candidates[0];
  if (!c) return '';
  if (c.telluric) return `${/telluric/i.test(c.species) ? c.species : `${c.species} telluric`}${c.band ? ` (${c.band})` : ''}`;
  return `${c.species} ${formatNumber(c.restWavelengthAngstrom, 2)}`;
}

/**
 * An element identification for people: which spectra are present or possible (and how
 * many were tested; a species that cannot be present because too few of its lines lie in
 * range gets a sentence saying so), the resolving power, velocity and medium used; a table
 * of the species with a verdict other than `not detected` (matched/expected lines,
 * log-likelihood ratio, false-alarm probabilities, significance, why not present) and a
 * table of the found lines with their best candidate.
 *
 * @param result from `identifySpectrum` or `identifyLines`; not modified.
 * @param context the spectrum (for the title).
 * @returns title, sentences and two tables.
 * @example summarizeIdentification(identifySpectrum(star), { spectrum: star }).lines[0]; // 'Present: Si II. Possible: H I. …'
 */
export function summarizeIdentification(result: IdentificationResult | SpectrumIdentification, context: ResultContext = {}): ResultSummary {
  const present = result.elements.filter((e) => e.verdict === 'present');
  const possible = result.elements.filter((e) => e.verdict === 'possible');
  const names = (list: typeof present) => (list.length ? list.map((e) => e.species).join(', ') : 'none');
  const identified = result.lines.filter((l) => l.candidates.length > 0).length;
  const lines = [
    `Present: ${names(present)}. Possible: ${names(possible)}. ${plural(result.speciesTested, 'spectrum', 'spectra')} tested; the others not detected.`,
    ...possible.filter((e) => e.reasons[0] === 'too-few-expected-lines').map((e) => `${e.species} is at most possible here: ${e.reason}.`),
    `${plural(result.lines.length, 'found line')}, ${identified} with at least one candidate; resolving power ${formatSignificant(result.resolvingPower, 3)} (${result.resolvingPowerSource}), list velocity ${formatNumber(result.velocityKmPerS, 2)} km/s, ${result.medium} wavelengths.`,
  ];
  const species: Table = {
    caption: 'Species present or possible',
    columns: [
      { key: 'species', label: 'Species' },
      { key: 'verdict', label: 'Verdict' },
      { key: 'matched', label: 'Matched / expected' },
      { key: 'strongest', label: 'Strongest matched' },
      { key: 'llr', label: 'ln LR', digits: 1 },
      { key: 'fap', label: 'FAP (adjusted)' },
      { key: 'shift', label: 'Shift-test FAP' },
      { key: 'sigma', label: 'Significance', unit: 'σ', digits: 1 },
      { key: 'reason', label: 'Why not present' },
    ],
    rows: [...present, ...possible].map((e): Record<string, TableCell> => ({
      species: e.species,
      verdict: e.verdict,
      matched: `${e.linesMatched} / ${e.linesExpected}`,
      strongest: e.strongestMatched,
      llr: e.logLikelihoodRatio,
      fap: formatProbability(e.adjustedFalseAlarmProbability),
      shift: e.shiftFalseAlarmProbability === null ? 'not run' : formatProbability(e.shiftFalseAlarmProbability),
      sigma: e.significanceSigma,
      reason: e.reason ?? '',
    })),
  };
  const capped = capRows(result.lines, 'lines');
  if (capped.note) lines.push(`Line table: ${capped.note}.`);
  const lineTable: Table = {
    caption: 'Found lines and their best candidate',
    columns: [
      { key: 'n', label: '#' },
      { key: 'wavelength', label: 'Wavelength', unit: 'Å', digits: 2 },
      { key: 'kind', label: 'Kind' },
      { key: 'best', label: 'Best candidate' },
      { key: 'delta', label: 'Found − expected', unit: 'Å', digits: 2 },
      { key: 'verdict', label: 'Its verdict' },
    ],
    rows: capped.rows.map((l): Record<string, TableCell> => {
      const c = l.candidates[0];
      return {
        n: l.index + 1,
        wavelength: l.wavelengthAngstrom,
        kind: l.kind,
        best: l.centreTooUncertain ? '(centre too uncertain)' : bestCandidateLabel(l),
        delta: c && !c.telluric ? c.deltaAngstrom : null,
        verdict: c ? c.verdict : '',
      };
    }),
  };
  return { title: titleWithObservation('Element identification', context), lines, tables: [species, lineTable] };
}
