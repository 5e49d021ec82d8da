import { resolve } from 'node:path';
import { InputError, UsageError } from '../../errors.js';
import type { MeasuredValue } from '../../fit/line-fit.js';
import { LINE_PROFILES, type LineProfile } from '../../fit/profiles.js';
import { readSpectrum } from '../../io/read.js';
import { availableSpecies, readLineList } from '../../lines/linelist.js';
import { lineListTemplate } from '../../lines/synthetic.js';
import { deriveSpectrum } from '../../spectrum/spectrum.js';
import { crossCorrelationVelocity, type CcfUncertaintyMethod, type CrossCorrelationResult } from '../../velocity/ccf.js';
import { applyVelocityCorrection, type DopplerFormula } from '../../velocity/doppler.js';
import { velocityFromLines, type LineVelocityResult, type LineVelocityRow } from '../../velocity/lines.js';
import { barycentricCorrectionFromHeader, type HeaderCorrection } from '../../velocity/observation.js';
import type { WavelengthCalibrationError } from '../../velocity/calibration-error.js';
import { flagOption, listOption, numberOption, stringOption, type Command, type ParsedArgs } from '../command.js';
import { OBSERVATION_OPTIONS, observationOverrides } from './observation-options.js';

/** What `lineshift velocity --json` prints. Velocities in km/s, positive receding. */
export interface VelocityReport {
  file: string;
  method: 'lines' | 'ccf';
  /** `barycentric` normally; `topocentric` with --topocentric (then radialVelocity is null). */
  frame: 'barycentric' | 'topocentric';
  /** Barycentric radial velocity: the measured one combined with the correction, 1 + z = (1 + z_meas)(1 + z_B); null with --topocentric. */
  radialVelocity: MeasuredValue | null;
  /** Velocity in the observer's frame, as measured. */
  measuredVelocity: MeasuredValue;
  /** Barycentric correction c·z_B, km/s (to add); null with --topocentric. */
  barycentricCorrection: number | null;
  /** BJD_TDB at the exposure mid-point; null with --topocentric. */
  bjdTdb: number | null;
  /** Exposure mid-point, ISO 8601 UTC; null with --topocentric. */
  midpoint: string | null;
  /** Header keywords the barycentric correction used. */
  keysUsed: readonly string[];
  formula: DopplerFormula;
  /** Medium of the spectrum's wavelengths (and of the wavelengths in `lines`). */
  medium: 'air' | 'vacuum';
  /** Lines method: the per-line table and the combination. */
  lines?: readonly LineVelocityRow[];
  combination?: {
    linesUsed: number; linesRejected: number; chiSquare: number; degreesOfFreedom: number; reducedChiSquare: number;
    uncertaintyScale: number; statisticalUncertaintyKmPerS: number; calibrationUncertaintyKmPerS: number; method: string;
    approximateVelocityKmPerS: number; approximateVelocitySource: string; resolvingPower: number; commonResolvingPower: number | null; profile: string;
  };
  /** Cross-correlation: the peak, the uncertainty estimates and the grid. */
  ccf?: {
    template: string;
    templateVelocityKmPerS: number;
    uncertaintyMethod: CcfUncertaintyMethod;
    uncertainties: CrossCorrelationResult['uncertainties'];
    peakHeight: number;
    peakFwhmKmPerS: number;
    tonryDavisR: number;
    grid: CrossCorrelationResult['grid'];
  };
}

const DEFAULT_SPECIES = ['H'];

/** `H` → `H I`; `Fe` → `Fe I`, `Fe II`; `Fe II` or `Fe_II` → `Fe II`. */
function expandSpecies(tokens: readonly string[]): string[] {
  const available = availableSpecies();
  const key = (s: string) => s.trim().replace(/[_\s]+/g, ' ').toLowerCase();
  const out: string[] = [];
  for (const t of tokens) {
    const exact = available.find((a) => key(a) === key(t));
    const found = exact ? [exact] : available.filter((a) => key(a).split(' ')[0] === key(t) && /^[a-z]+ [ivx]+$/.test(key(a)));
    if (found.length === 0) {
      const elements = [...new Set(available.filter((a) => / [IVX]+$/.test(a)).map((a) => a.split(' ')[0]))];
      throw new UsageError('cli.unknown-species', `no line list for "${t}" (elements: ${elements.join(', ')}; or a spectrum such as "Fe II")`);
    }
    for (const f of found) if (!out.includes(f)) out.push(f);
  }
  return out;
}

function choice<T extends string>(args: ParsedArgs, name: string, allowed: readonly T[]): T | undefined {
  const v = stringOption(args, name);
  if (v !== undefined && !allowed.includes(v as T)) throw new UsageError('cli.bad-choice', `--${name} must be ${allowed.join(', ')}; got "${v}"`);
  return v as T | undefined;
}

function calibrationOption(args: ParsedArgs): WavelengthCalibrationError | undefined {
  const rms = numberOption(args, 'calibration-rms');
  const lines = numberOption(args, 'calibration-lines');
  const terms = numberOption(args, 'calibration-terms');
  if (rms === undefined && lines === undefined && terms === undefined) return undefined;
  if (rms === undefined || lines === undefined || terms === undefined) {
    throw new UsageError('cli.missing-option', '--calibration-rms, --calibration-lines and --calibration-terms go together');
  }
  return { rmsAngstrom: rms, lineCount: lines, coefficients: terms };
}

const fmt = (m: MeasuredValue, digits = 3) => `${m.value.toFixed(digits)} ± ${m.uncertainty.toFixed(digits)}`;

function describe(r: VelocityReport): string {
  const out: string[] = [r.file];
  if (r.radialVelocity) out.push(`  radial velocity: ${fmt(r.radialVelocity)} km/s (barycentric, ${r.formula} Doppler formula)`);
  out.push(`  measured:        ${fmt(r.measuredVelocity)} km/s (observer's frame${r.frame === 'topocentric' ? ', no barycentric correction' : ''})`);
  if (r.barycentricCorrection !== null) {
    out.push(`  barycentric correction: ${r.barycentricCorrection.toFixed(4)} km/s; BJD_TDB ${r.bjdTdb!.toFixed(6)}; mid-point ${r.midpoint} UTC`);
    if (r.keysUsed.length) out.push(`  header keys used: ${r.keysUsed.join(', ')}`);
  }
  if (r.combination) {
    const c = r.combination;
    out.push(`  method: lines, ${c.linesUsed} used, ${c.linesRejected} rejected; χ²/ν ${Number.isFinite(c.reducedChiSquare) ? c.reducedChiSquare.toFixed(2) : '–'} (ν = ${c.degreesOfFreedom})${c.uncertaintyScale !== 1 ? `, error scaled ×${c.uncertaintyScale.toFixed(2)}` : ''}${c.calibrationUncertaintyKmPerS > 0 ? `, calibration ${c.calibrationUncertaintyKmPerS.toFixed(3)} km/s` : ''}`);
    out.push(`  wavelengths in ${r.medium}, Å`);
    out.push(`  ${'species'.padEnd(8)} ${'rest'.padStart(10)}  ${'observed'.padStart(21)}  ${'velocity km/s'.padStart(17)}  status`);
    for (const l of r.lines ?? []) {
      const obs = l.observedWavelengthAngstrom ? `${l.observedWavelengthAngstrom.value.toFixed(4)} ± ${l.observedWavelengthAngstrom.uncertainty.toFixed(4)}` : '';
      const vel = l.velocityKmPerS ? fmt(l.velocityKmPerS, 2) : '';
      out.push(`  ${l.species.padEnd(8)} ${l.restWavelengthAngstrom.toFixed(3).padStart(10)}  ${obs.padStart(21)}  ${vel.padStart(17)}  ${l.status === 'used' ? 'used' : `rejected: ${l.note}`}`);
    }
  }
  if (r.ccf) {
    const c = r.ccf;
    out.push(`  method: cross-correlation with ${c.template}; peak height ${c.peakHeight.toFixed(3)}, FWHM ${c.peakFwhmKmPerS.toFixed(1)} km/s`);
    out.push(`  uncertainty (${c.uncertaintyMethod}): propagated ${c.uncertainties.propagated.toFixed(3)}, Zucker 2003 ${c.uncertainties.zucker2003.toFixed(3)}, Tonry & Davis 1979 ${c.uncertainties.tonryDavis1979.toFixed(3)}${c.uncertainties.calibration > 0 ? `, calibration ${c.uncertainties.calibration.toFixed(3)}` : ''} km/s`);
    out.push(`  grid: ${c.grid.startAngstrom.toFixed(1)}–${c.grid.endAngstrom.toFixed(1)} Å (vacuum), ${c.grid.pixels} pixels of ${c.grid.velocityStepKmPerS.toFixed(3)} km/s`);
  }
  return out.join('\n') + '\n';
}

export const velocityCommand: Command = {
  name: 'velocity',
  summary: 'radial velocity of a star from its lines or by cross-correlation, barycentric-corrected',
  usage: 'SPECTRUM [--method lines|ccf] [--template FILE] [--lines LIST | --species H,Fe] [--ra DEG --dec DEG --lat DEG --lon DEG --height M --time ISO --exptime S] [--topocentric] [--json]',
  description: `Measures the line-of-sight velocity of the star in SPECTRUM (km/s, positive receding)
and corrects it to the solar-system barycentre. --method lines (default) fits each line of
a line list (--lines FILE, or the shipped lists of --species, default H) near where an
approximate velocity puts it and combines the line velocities (weighted mean with outlier
rejection). --method ccf cross-correlates with --template FILE (an observed spectrum at
--template-velocity), or with a template made from the line list. The barycentric
correction, BJD_TDB and the mid-point come from the header (DATE-OBS, EXPTIME, RA/DEC,
SITELAT/SITELONG or OBSGEO-X/Y/Z, ...) and the options, which override it; with
--topocentric no correction is made. The spectrum must say whether its wavelengths are in
air or vacuum, or --medium must.`,
  options: [
    { name: 'method', type: 'string', valueName: 'lines|ccf', description: 'velocity from individual lines (default) or by cross-correlation' },
    { name: 'template', type: 'string', valueName: 'FILE', description: 'ccf: template spectrum (default: a template made from the line list)' },
    { name: 'template-velocity', type: 'number', valueName: 'KM/S', description: 'ccf: the template\'s own radial velocity (default 0)' },
    { name: 'template-medium', type: 'string', valueName: 'air|vacuum', description: 'ccf: medium of the template\'s wavelengths when it does not say' },
    { name: 'lines', type: 'string', valueName: 'LIST', description: 'line list file (CSV, as data/linelists/)' },
    { name: 'species', type: 'list', valueName: 'H,Fe,...', description: 'shipped line lists: elements (all their spectra) or spectra such as "Fe II" (default H)' },
    { name: 'max-lines', type: 'number', valueName: 'N', description: 'strongest lines used per species (default 30)' },
    { name: 'medium', type: 'string', valueName: 'air|vacuum', description: 'medium of the spectrum\'s wavelengths when the file does not say' },
    { name: 'resolving-power', type: 'number', valueName: 'R', description: 'λ/FWHM of the spectrograph (default: from 2.5 pixels per resolution element)' },
    { name: 'approximate', type: 'number', valueName: 'KM/S', description: 'lines: approximate velocity that places the lines (default: found by cross-correlation)' },
    { name: 'velocity-range', type: 'list', valueName: 'MIN,MAX', description: 'velocities searched, km/s (default -500,500)' },
    { name: 'profile', type: 'string', valueName: 'gaussian|lorentzian|voigt', description: 'lines: profile fitted to each line (default gaussian)' },
    { name: 'formula', type: 'string', valueName: 'relativistic|classical', description: 'Doppler formula (default relativistic)' },
    { name: 'uncertainty', type: 'string', valueName: 'propagated|zucker-2003|tonry-davis-1979', description: 'ccf: which uncertainty estimate to report (default propagated)' },
    { name: 'calibration-rms', type: 'number', valueName: 'Å', description: 'rms of the dispersion solution (with --calibration-lines and --calibration-terms)' },
    { name: 'calibration-lines', type: 'number', valueName: 'N', description: 'lamp lines the dispersion solution was fitted to' },
    { name: 'calibration-terms', type: 'number', valueName: 'P', description: 'coefficients of the dispersion solution (order + 1)' },
    ...OBSERVATION_OPTIONS,
    { name: 'hdu', type: 'number', valueName: 'N', description: 'FITS HDU to read (0-based)' },
    { name: 'topocentric', type: 'boolean', description: 'report the velocity in the observer\'s frame, without barycentric correction' },
  ],
  positionals: { min: 1, max: 1, name: 'SPECTRUM' },
  async run(args, io) {
    const file = args.positionals[0];
    const method = choice(args, 'method', ['lines', 'ccf'] as const) ?? 'lines';
    const formula = choice(args, 'formula', ['relativistic', 'classical'] as const);
    const medium = choice(args, 'medium', ['air', 'vacuum'] as const);
    const templateMedium = choice(args, 'template-medium', ['air', 'vacuum'] as const);
    const profile = choice(args, 'profile', LINE_PROFILES as readonly LineProfile[]);
    const uncertaintyMethod = choice(args, 'uncertainty', ['propagated', 'zucker-2003', 'tonry-davis-1979'] as const);
    const rangeTokens = listOption(args, 'velocity-range');
    let velocityRangeKmPerS: { min: number; max: number } | undefined;
    if (rangeTokens) {
      const [min, max] = rangeTokens.map(Number);
      if (rangeTokens.length !== 2 || !Number.isFinite(min) || !Number.isFinite(max) || !(max > min)) {
        throw new UsageError('cli.bad-range', `--velocity-range needs MIN,MAX in km/s with MIN < MAX, got "${rangeTokens.join(',')}"`);
      }
      velocityRangeKmPerS = { min, max };
    }
    const linesFile = stringOption(args, 'lines');
    const speciesTokens = listOption(args, 'species');
    if (linesFile !== undefined && speciesTokens !== undefined) throw new UsageError('cli.conflicting-options', 'give --lines or --species, not both');
    const templateFile = stringOption(args, 'template');
    if (templateFile !== undefined && method !== 'ccf') throw new UsageError('cli.conflicting-options', '--template goes with --method ccf');
    const calibration = calibrationOption(args);
    const topocentric = flagOption(args, 'topocentric');
    const { overrides, headerLongitude } = observationOverrides(args);
    const hdu = numberOption(args, 'hdu');

    // Messages name the file as given, not the resolved path.
    const read = readSpectrum(resolve(io.cwd, file), { hdu, logger: io.logger });
    const spectrum = read.source ? deriveSpectrum(read, { source: { ...read.source, file } }) : read;
    const list = linesFile !== undefined ? readLineList(resolve(io.cwd, linesFile)) : undefined;
    const species = list ? undefined : expandSpecies(speciesTokens ?? DEFAULT_SPECIES);
    const maxLinesPerSpecies = numberOption(args, 'max-lines');
    const resolvingPower = numberOption(args, 'resolving-power');

    // The barycentric correction first: a missing input should stop us before the fits.
    let correction: HeaderCorrection | null = null;
    if (!topocentric) {
      try {
        correction = barycentricCorrectionFromHeader(spectrum.header, overrides, { file, hdu, logger: io.logger, headerLongitude });
      } catch (e) {
        if (e instanceof InputError && e.code === 'observation.missing') {
          throw new InputError(e.code, `${e.detail}; or give --topocentric for the velocity in the observer's frame`, e.location);
        }
        throw e;
      }
    }

    let measured: MeasuredValue;
    let converged: boolean;
    let whyNot = '';
    let usedFormula: DopplerFormula;
    let usedMedium: 'air' | 'vacuum';
    const report: Partial<VelocityReport> = {};
    if (method === 'lines') {
      const r: LineVelocityResult = velocityFromLines(spectrum, {
        ...(list ? { lines: list } : { species }),
        maxLinesPerSpecies, resolvingPower, profile, formula, calibration, spectrumMedium: medium, logger: io.logger,
        approximateVelocity: numberOption(args, 'approximate'), velocityRangeKmPerS,
      });
      measured = r.velocity;
      converged = r.converged;
      whyNot = r.message;
      usedFormula = r.formula;
      usedMedium = r.medium;
      report.lines = r.lines;
      report.combination = {
        linesUsed: r.linesUsed, linesRejected: r.linesRejected, chiSquare: r.chiSquare, degreesOfFreedom: r.degreesOfFreedom,
        reducedChiSquare: r.reducedChiSquare, uncertaintyScale: r.uncertaintyScale, statisticalUncertaintyKmPerS: r.statisticalUncertaintyKmPerS,
        calibrationUncertaintyKmPerS: r.calibrationUncertaintyKmPerS, method: r.combination,
        approximateVelocityKmPerS: r.approximateVelocityKmPerS, approximateVelocitySource: r.approximateVelocitySource,
        resolvingPower: r.resolvingPower, commonResolvingPower: r.commonResolvingPower, profile: r.profile,
      };
    } else {
      let template;
      let templateName: string;
      if (templateFile !== undefined) {
        const t = readSpectrum(resolve(io.cwd, templateFile), { logger: io.logger });
        template = t.source ? deriveSpectrum(t, { source: { ...t.source, file: templateFile } }) : t;
        templateName = templateFile;
      } else {
        const w = spectrum.wavelength;
        const lo = Math.min(w[0], w[w.length - 1]);
        const hi = Math.max(w[0], w[w.length - 1]);
        const scale = spectrum.unit === 'nm' ? 10 : spectrum.unit === 'um' ? 1e4 : 1;
        const R = resolvingPower ?? (w.length > 2 ? (0.5 * (lo + hi)) / (2.5 * ((hi - lo) / (w.length - 1))) : NaN);
        const stated = spectrum.medium ?? medium ?? 'air';
        template = lineListTemplate({ ...(list ? { list } : { species }), maxLinesPerSpecies, startAngstrom: lo * scale, endAngstrom: hi * scale, medium: stated, resolvingPower: R });
        templateName = `a template of ${list ? linesFile : species!.join(', ')} lines at R ${R.toFixed(0)}`;
      }
      const templateVelocity = numberOption(args, 'template-velocity');
      const r = crossCorrelationVelocity(spectrum, template, {
        velocityRangeKmPerS, formula, templateVelocityKmPerS: templateVelocity, spectrumMedium: medium, templateMedium,
        uncertaintyMethod, calibration,
      });
      measured = r.velocity;
      converged = r.converged;
      whyNot = r.message;
      usedFormula = r.formula;
      usedMedium = spectrum.medium ?? medium!;
      report.ccf = {
        template: templateName, templateVelocityKmPerS: r.templateVelocityKmPerS, uncertaintyMethod: r.uncertaintyMethod,
        uncertainties: r.uncertainties, peakHeight: r.peak.height, peakFwhmKmPerS: r.peak.fwhmKmPerS, tonryDavisR: r.peak.tonryDavisR, grid: r.grid,
      };
    }

    let radial: MeasuredValue | null = null;
    if (correction && converged) {
      const bc = correction.barycentricCorrectionKmPerS;
      const v = applyVelocityCorrection(measured.value, bc, { formula: usedFormula });
      // The correction's own error (a few m/s) is far below any measured one and is left out.
      const h = Math.max(1e-6, measured.uncertainty);
      const slope = (applyVelocityCorrection(measured.value + h, bc, { formula: usedFormula }) - applyVelocityCorrection(measured.value - h, bc, { formula: usedFormula })) / (2 * h);
      radial = { value: v, uncertainty: Math.abs(slope) * measured.uncertainty };
    }
    const out: VelocityReport = {
      file,
      method,
      frame: topocentric ? 'topocentric' : 'barycentric',
      radialVelocity: radial,
      measuredVelocity: measured,
      barycentricCorrection: correction ? correction.barycentricCorrectionKmPerS : null,
      bjdTdb: correction ? correction.bjdTdb : null,
      midpoint: correction ? correction.midpoint : null,
      keysUsed: correction ? correction.keysUsed : [],
      formula: usedFormula,
      medium: usedMedium,
      ...report,
    };
    io.stdout(args.json ? JSON.stringify(out) + '\n' : describe(out));
    if (!converged) {
      io.stderr(`lineshift: ${file}: no velocity: ${whyNot}\n`);
      return 1;
    }
    return 0;
  },
};
