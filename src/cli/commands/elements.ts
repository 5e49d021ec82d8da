import { resolve } from 'node:path';
import { UsageError } from '../../errors.js';
import { IDENTIFY_DEFAULTS } from '../../elements/identify.js';
import { identifySpectrum, type IdentifySpectrumOptions, type SpectrumIdentification } from '../../elements/spectrum.js';
import type { LineCandidate, SpeciesEvidence } from '../../elements/types.js';
import { readSpectrum } from '../../io/read.js';
import { SPEED_OF_LIGHT_KM_PER_S } from '../../spectrum/constants.js';
import { listOption, numberOption, stringOption, type Command, type ParsedArgs } from '../command.js';

/** One species in `lineshift elements --json`. */
export interface ElementsReportSpecies {
  species: string;
  element: string;
  verdict: SpeciesEvidence['verdict'];
  linesMatched: number;
  linesExpected: number;
  falseAlarmProbability: number;
  adjustedFalseAlarmProbability: number;
  shiftFalseAlarmProbability: number | null;
  /** One-sided Gaussian-equivalent significance of the adjusted false-alarm probability; null when infinite. */
  significance: number | null;
  logLikelihoodRatio: number;
  strongestMatched: boolean | null;
  rankedByIntensity: boolean;
  otherLinesMatched: number;
  missingWavelengthsAngstrom: number[];
  /** Species called present whose lines this species' matches were, when that decided its verdict. */
  explainedBy: string[];
  /** Why the verdict is not the next better one (empty for present). */
  reasons: SpeciesEvidence['reasons'][number][];
  /** The reasons in words, or null for present. */
  reason: string | null;
}

/** One found line in `lineshift elements --json`. */
export interface ElementsReportLine {
  wavelengthAngstrom: number;
  wavelengthUncertaintyAngstrom: number;
  kind: 'absorption' | 'emission';
  fwhmAngstrom: number;
  /** Depth or height in continuum units (null when not fitted). */
  strength: number | null;
  /** Equivalent width, Å (null when not fitted). */
  equivalentWidthAngstrom: number | null;
  significance: number;
  fitted: boolean;
  toleranceAngstrom: number;
  telluric: boolean;
  centreTooUncertain: boolean;
  identifications: Pick<LineCandidate, 'species' | 'telluric' | 'band' | 'restWavelengthAngstrom' | 'expectedWavelengthAngstrom' | 'deltaAngstrom' | 'score' | 'verdict'>[];
}

/** What `lineshift elements --json` prints. */
export interface ElementsReport {
  file: string;
  resolvingPower: number;
  resolvingPowerSource: 'given' | 'line widths';
  velocityKmPerS: number;
  /** The found lines' mean offset from their identifications, km/s, on top of velocityKmPerS (null with fewer than 3 lines of present species). */
  residualVelocity: SpectrumIdentification['residualVelocity'];
  medium: 'air' | 'vacuum';
  speciesTested: number;
  shiftTrials: number;
  telluricApplied: boolean;
  thresholds: SpectrumIdentification['thresholds'];
  /** Most certain first. */
  elements: ElementsReportSpecies[];
  /** Found lines in wavelength order, with their ranked identifications. */
  lines: ElementsReportLine[];
  provenance: SpectrumIdentification['provenance'];
}

const finite = (x: number): number | null => (Number.isFinite(x) ? x : null);

/** Reads the command's options. @throws {UsageError} for malformed values. */
export function elementsCommandOptions(args: ParsedArgs): IdentifySpectrumOptions {
  const velocity = numberOption(args, 'velocity');
  const r = numberOption(args, 'resolving-power');
  if (r !== undefined && !(r > 0)) throw new UsageError('cli.bad-resolving-power', `option --resolving-power must be > 0, got ${r}`);
  const rms = numberOption(args, 'calibration-rms');
  if (rms !== undefined && !(rms >= 0)) throw new UsageError('cli.bad-calibration-rms', `option --calibration-rms must be ≥ 0, got ${rms}`);
  const significance = numberOption(args, 'significance');
  if (significance !== undefined && !(significance > 0)) throw new UsageError('cli.bad-significance', `option --significance must be > 0, got ${significance}`);
  const telluric = stringOption(args, 'telluric');
  if (telluric !== undefined && !['auto', 'on', 'off'].includes(telluric)) {
    throw new UsageError('cli.bad-telluric', `option --telluric must be auto, on or off, got "${telluric}"`);
  }
  const species = listOption(args, 'species')?.map((s) => s.trim()).filter((s) => s.length > 0);
  return {
    ...(velocity !== undefined ? { velocityKmPerS: velocity } : {}),
    ...(r !== undefined ? { resolvingPower: r } : {}),
    ...(rms !== undefined ? { calibrationRmsAngstrom: rms } : {}),
    ...(significance !== undefined ? { significance } : {}),
    ...(telluric !== undefined ? { telluric: telluric as 'auto' | 'on' | 'off' } : {}),
    ...(species !== undefined && species.length > 0 ? { species } : {}),
  };
}

/** The JSON report of an identification. */
export function elementsReport(r: SpectrumIdentification, file: string): ElementsReport {
  return {
    file,
    resolvingPower: r.resolvingPower,
    resolvingPowerSource: r.resolvingPowerSource,
    velocityKmPerS: r.velocityKmPerS,
    residualVelocity: r.residualVelocity,
    medium: r.medium,
    speciesTested: r.speciesTested,
    shiftTrials: r.shiftTrials,
    telluricApplied: r.telluricApplied,
    thresholds: r.thresholds,
    elements: r.elements.map((e) => ({
      species: e.species,
      element: e.element,
      verdict: e.verdict,
      linesMatched: e.linesMatched,
      linesExpected: e.linesExpected,
      falseAlarmProbability: e.falseAlarmProbability,
      adjustedFalseAlarmProbability: e.adjustedFalseAlarmProbability,
      shiftFalseAlarmProbability: e.shiftFalseAlarmProbability,
      significance: finite(e.significanceSigma),
      logLikelihoodRatio: e.logLikelihoodRatio,
      strongestMatched: e.strongestMatched,
      rankedByIntensity: e.rankedByIntensity,
      otherLinesMatched: e.otherLinesMatched,
      missingWavelengthsAngstrom: [...e.missingWavelengthsAngstrom],
      explainedBy: [...e.explainedBy],
      reasons: [...e.reasons],
      reason: e.reason,
    })),
    lines: r.lines.map((l) => {
      const f = r.found[l.index];
      return {
        wavelengthAngstrom: f.wavelengthAngstrom,
        wavelengthUncertaintyAngstrom: f.wavelengthUncertaintyAngstrom,
        kind: f.kind,
        fwhmAngstrom: f.fwhmAngstrom,
        strength: finite(f.strength),
        equivalentWidthAngstrom: finite(f.equivalentWidthAngstrom),
        significance: f.significance,
        fitted: f.fitted,
        toleranceAngstrom: l.toleranceAngstrom,
        telluric: l.telluric,
        centreTooUncertain: l.centreTooUncertain,
        identifications: l.candidates.map((c) => ({
          species: c.species,
          telluric: c.telluric,
          band: c.band,
          restWavelengthAngstrom: c.restWavelengthAngstrom,
          expectedWavelengthAngstrom: c.expectedWavelengthAngstrom,
          deltaAngstrom: c.deltaAngstrom,
          score: c.score,
          verdict: c.verdict,
        })),
      };
    }),
    provenance: r.provenance,
  };
}

function fmtProb(p: number): string {
  return p >= 0.001 ? p.toFixed(3) : p.toExponential(1);
}

function table(rows: string[][]): string[] {
  const widths = rows[0].map((_, j) => Math.max(...rows.map((row) => row[j].length)));
  return rows.map((row) => '  ' + row.map((cell, j) => cell.padEnd(widths[j])).join('  ').trimEnd());
}

/** The human-readable report: heading, species table (with why a species is not present), not-detected list, found lines with their best identification. */
export function formatElementsReport(r: SpectrumIdentification, file: string): string {
  const out = [
    `${file}: ${r.found.length} line${r.found.length === 1 ? '' : 's'} found; R = ${Math.round(r.resolvingPower)} (${r.resolvingPowerSource}); velocity ${r.velocityKmPerS} km/s${r.residualVelocity ? ` (lines of present species sit ${r.residualVelocity.valueKmPerS >= 0 ? '+' : '−'}${Math.abs(r.residualVelocity.valueKmPerS).toFixed(1)} ± ${r.residualVelocity.uncertaintyKmPerS.toFixed(1)} km/s off it)` : ''}; ${r.medium} wavelengths; ${r.speciesTested} spectra tested${r.telluricApplied ? '; telluric bands flagged' : ''}`,
    '',
  ];
  const shown = r.elements.filter((e) => e.verdict !== 'not detected');
  if (shown.length) {
    out.push(
      ...table([
        ['species', 'verdict', 'lines', 'false alarm', 'adjusted', 'σ', 'strongest line', 'why not present'],
        ...shown.map((e) => [
          e.species, e.verdict, `${e.linesMatched}/${e.linesExpected}`, fmtProb(e.falseAlarmProbability), fmtProb(e.adjustedFalseAlarmProbability),
          Number.isFinite(e.significanceSigma) ? e.significanceSigma.toFixed(1) : '>40', e.strongestMatched === null ? '—' : e.strongestMatched ? 'found' : 'missing',
          e.reason ?? '',
        ]),
      ]),
    );
  } else {
    out.push('  no species present or possible');
  }
  if (!r.elements.some((e) => e.verdict === 'present') && r.found.length > 0) {
    // Lines match within about k × c (blend fraction) of a resolution element: a faster object's lines all miss.
    const reach = (IDENTIFY_DEFAULTS.toleranceSigmas * IDENTIFY_DEFAULTS.blendFraction * SPEED_OF_LIGHT_KM_PER_S) / r.resolvingPower;
    out.push('', `  (the lists were placed at ${r.velocityKmPerS} km/s; lines of an object moving more than about ${Math.round(reach)} km/s faster or slower than that miss them: measure its velocity with \`lineshift velocity\` and give it with --velocity)`);
  }
  const none = r.elements.filter((e) => e.verdict === 'not detected' && e.linesExpected > 0).map((e) => e.species);
  if (none.length) out.push('', `not detected: ${none.join(', ')}`);
  if (r.lines.length) {
    out.push('', 'found lines (best identification):');
    out.push(
      ...table([
        ['λ (Å)', 'kind', 'identification', 'rest λ (Å)', 'Δλ (Å)', 'share'],
        ...r.lines.map((l) => {
          const f = r.found[l.index];
          const best = l.candidates[0];
          const lam = `${f.wavelengthAngstrom.toFixed(2)} ± ${f.wavelengthUncertaintyAngstrom.toFixed(2)}`;
          if (l.centreTooUncertain) return [lam, f.kind, '(centre too uncertain)', '', '', ''];
          if (!best) return [lam, f.kind, '—', '', '', ''];
          return [
            lam, f.kind, best.telluric ? `${best.band} (telluric)` : `${best.species} (${best.verdict})`,
            best.telluric ? '' : best.restWavelengthAngstrom.toFixed(3), best.telluric ? '' : best.deltaAngstrom.toFixed(2), best.score.toFixed(2),
          ];
        }),
      ]),
    );
  }
  return out.join('\n') + '\n';
}

export const elementsCommand: Command = {
  name: 'elements',
  summary: 'which elements are present: identify the found lines with the line lists and weigh the evidence per species',
  usage: 'SPECTRUM [--velocity KMS] [--species H,He,Fe,...] [--resolving-power R] [--calibration-rms Å] [--significance σ] [--telluric auto|on|off] [--json]',
  description: `Finds and fits the lines of a wavelength-calibrated FITS or text spectrum, compares
each with the shipped line lists (air wavelengths; converted for vacuum spectra; shifted by
--velocity, km/s, positive receding) within a tolerance of 3 σ, σ combining the fitted centre's
uncertainty, the calibration RMS and 0.15 of a resolution element, and weighs the evidence
for each spectrum (Fe I, Fe II, …): how many of its strong lines are found, how many are
missing where they should be visible, and the probability that chance coincidences do as
well. Verdicts: present (at least two strong lines, the strongest among them, adjusted
false-alarm probability ≤ 0.01), possible, not detected; for a possible species the table
says which condition of present it misses (e.g. only one of its lines in range). A telluric
band ranks below an atomic line of a present or possible species, and a line too deep or
too broad for a weak band is not put down to it. Without --resolving-power it is
estimated from the fitted line widths. Telluric O2 and H2O bands are flagged in absorption
spectra. With --json: {elements: [...], lines: [...]}, elements most certain first.`,
  options: [
    { name: 'velocity', type: 'number', valueName: 'KMS', description: 'radial velocity of the object, km/s (default 0)' },
    { name: 'species', type: 'list', valueName: 'LIST', description: 'elements or spectra to consider, e.g. H,He,Fe or Fe II (default: all shipped lists)' },
    { name: 'resolving-power', type: 'number', valueName: 'R', description: 'λ/Δλ of the spectrum (default: from the fitted widths)' },
    { name: 'calibration-rms', type: 'number', valueName: 'Å', description: 'RMS of the wavelength calibration (default 0)' },
    { name: 'significance', type: 'number', valueName: 'σ', description: 'line-finding threshold (default 5)' },
    { name: 'telluric', type: 'string', valueName: 'MODE', description: 'telluric bands: auto (absorption spectra; default), on or off' },
  ],
  positionals: { min: 1, max: 1, name: 'SPECTRUM' },
  async run(args, io) {
    const file = args.positionals[0];
    const options = elementsCommandOptions(args);
    const spectrum = readSpectrum(resolve(io.cwd, file), { logger: io.logger });
    const result = identifySpectrum(spectrum, { ...options, logger: io.logger });
    io.stdout(args.json ? JSON.stringify(elementsReport(result, file)) + '\n' : formatElementsReport(result, file));
    return 0;
  },
};
