import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { UsageError } from '../../errors.js';
import type { Measured } from '../../orbit/mass-function.js';
import { messages } from '../../orbit/messages.js';
import { fitOrbit, type OrbitFit } from '../../orbit/orbit-fit.js';
import { parseVelocityTable } from '../../orbit/table.js';
import { flagOption, numberOption, stringOption, type Command } from '../command.js';

/** Rounds a value and its uncertainty to two significant digits of the uncertainty. */
export function formatMeasured(m: Measured): string {
  if (!Number.isFinite(m.uncertainty) || m.uncertainty <= 0) return `${m.value.toPrecision(6)} ± ${Number.isNaN(m.uncertainty) ? 'n/a' : m.uncertainty}`;
  const digits = Math.max(0, Math.min(12, 1 - Math.floor(Math.log10(m.uncertainty))));
  return `${m.value.toFixed(digits)} ± ${m.uncertainty.toFixed(digits)}`;
}

/** What `lineshift orbit --json` prints. */
export function orbitJson(file: string, fit: OrbitFit): Record<string, unknown> {
  const t = fit.circularTest;
  return {
    file,
    units: {
      period: 'd', periastronTime: 'BJD_TDB', omega: 'deg (star 1)', semiAmplitude: 'km/s', systemicVelocity: 'km/s', meanLongitude: 'deg',
      massFunction: 'nominal solar masses', projectedSemiMajorAxis: 'km', rms: 'km/s', jitter: 'km/s', m1SinI3: 'nominal solar masses', m2SinI3: 'nominal solar masses',
    },
    converged: fit.converged,
    reason: fit.reason,
    message: fit.message,
    doubleLined: fit.doubleLined,
    period: fit.periodDays,
    periastronTime: fit.periastronTimeBjdTdb,
    eccentricity: fit.eccentricity,
    omega: fit.omegaDeg,
    semiAmplitude: fit.semiAmplitudeKmPerS,
    systemicVelocity: fit.systemicVelocityKmPerS,
    meanLongitude: fit.meanLongitudeDeg,
    referenceTime: fit.referenceTimeBjdTdb,
    massFunction: fit.massFunctionSolarMass,
    projectedSemiMajorAxis: fit.projectedSemiMajorAxisKm,
    ...(fit.doubleLined ? {
      semiAmplitude2: fit.semiAmplitude2KmPerS, massRatio: fit.massRatio, m1SinI3: fit.m1SinI3SolarMass, m2SinI3: fit.m2SinI3SolarMass, rms2: fit.rms2KmPerS,
    } : {}),
    jitter: fit.jitterKmPerS,
    chiSquare: fit.chiSquare,
    degreesOfFreedom: fit.degreesOfFreedom,
    reducedChiSquare: fit.reducedChiSquare,
    rms: fit.rmsKmPerS,
    lucySweeney: {
      probability: t.probability, circularPreferred: t.circularPreferred, fStatistic: t.fStatistic,
      chiSquareEccentric: t.chiSquareEccentric, chiSquareCircular: t.chiSquareCircular,
      circular: {
        period: t.circular.periodDays, maximumVelocityTime: t.circular.maximumVelocityTimeBjdTdb,
        semiAmplitude: t.circular.semiAmplitudeKmPerS, systemicVelocity: t.circular.systemicVelocityKmPerS,
        ...(t.circular.semiAmplitude2KmPerS ? { semiAmplitude2: t.circular.semiAmplitude2KmPerS } : {}),
        converged: t.circular.converged,
      },
    },
    covarianceNames: fit.covarianceNames,
    covariance: fit.covariance,
    alternatives: fit.alternatives.map((a) => ({ period: a.periodDays, chiSquare: a.chiSquare })),
    startingPeriods: fit.startingPeriodsDays,
    residuals: Array.from(fit.residualKmPerS),
    ...(fit.residual2KmPerS ? { residuals2: Array.from(fit.residual2KmPerS, (x) => (Number.isNaN(x) ? null : x)) } : {}),
    provenance: fit.provenance,
  };
}

function describe(file: string, n: number, fit: OrbitFit): string {
  const row = (name: string, value: string) => `  ${name.padEnd(22)}${value}`;
  const t = fit.circularTest;
  const lines = [
    `${file}: ${n} epochs, ${fit.doubleLined ? 'double-lined' : 'single-lined'} orbit fit ${fit.converged ? 'converged' : 'DID NOT CONVERGE'} (${fit.message})`,
    row('period P', `${formatMeasured(fit.periodDays)} d`),
    row('periastron time T', `${formatMeasured(fit.periastronTimeBjdTdb)} BJD_TDB`),
    row('eccentricity e', formatMeasured(fit.eccentricity)),
    row('omega (star 1)', `${formatMeasured(fit.omegaDeg)} deg`),
    row('semi-amplitude K1', `${formatMeasured(fit.semiAmplitudeKmPerS)} km/s`),
  ];
  if (fit.doubleLined) lines.push(row('semi-amplitude K2', `${formatMeasured(fit.semiAmplitude2KmPerS!)} km/s`));
  lines.push(row('systemic velocity', `${formatMeasured(fit.systemicVelocityKmPerS)} km/s`));
  if (fit.doubleLined) {
    lines.push(row('mass ratio q = K1/K2', formatMeasured(fit.massRatio!)));
    lines.push(row('m1 sin^3 i', `${formatMeasured(fit.m1SinI3SolarMass!)} solar masses`));
    lines.push(row('m2 sin^3 i', `${formatMeasured(fit.m2SinI3SolarMass!)} solar masses`));
  }
  lines.push(row('mass function f(m)', `${formatMeasured(fit.massFunctionSolarMass)} solar masses`));
  lines.push(row('a1 sin i', `${formatMeasured(fit.projectedSemiMajorAxisKm)} km`));
  if (fit.jitterKmPerS > 0) lines.push(row('jitter', `${fit.jitterKmPerS.toFixed(3)} km/s (added in quadrature)`));
  lines.push(row('residuals', `rms ${fit.rmsKmPerS.toFixed(3)} km/s${fit.doubleLined ? ` (star 2: ${fit.rms2KmPerS!.toFixed(3)} km/s)` : ''}; chi-square ${fit.chiSquare.toFixed(2)} for ${fit.degreesOfFreedom} degrees of freedom`));
  const p = t.probability >= 0.001 ? t.probability.toFixed(3) : t.probability.toExponential(1);
  lines.push(row('eccentricity test', `p = ${p} (Lucy & Sweeney 1971): ${t.circularPreferred ? 'not significant at 5%, a circular orbit is preferred' : 'significant at 5%, the orbit is eccentric'}`));
  // Δχ² < 9: as good as the best fit within about 3σ for one parameter (common practice)
  const close = fit.alternatives.filter((a) => a.chiSquare - fit.chiSquare < 9);
  if (close.length > 0) {
    lines.push(row('also fits nearly as well', close.map((a) => `P = ${a.periodDays.toPrecision(6)} d (chi-square ${a.chiSquare.toFixed(2)})`).join(', ') + ' — likely aliases; more nights would tell them apart'));
  }
  return lines.join('\n') + '\n';
}

export const orbitCommand: Command = {
  name: 'orbit',
  summary: 'fit a Keplerian orbit to a velocity table: P, T, e, omega, K, gamma, mass function',
  usage: 'TABLE [--period-guess D] [--double] [--jitter estimate|KM_S] [--json]',
  description: `Reads a velocity table (CSV with columns bjd_tdb, velocity_km_s, uncertainty_km_s,
and velocity2_km_s, uncertainty2_km_s for a double-lined binary; or JSON) and fits the
orbit: period P (d), time of periastron T (BJD_TDB), eccentricity e, argument of
periastron omega of star 1 (deg), semi-amplitude K (km/s, > 0) and systemic velocity
gamma (km/s), each with its 1-sigma uncertainty, the mass function (solar masses), and the
Lucy & Sweeney (1971) test of whether the eccentricity is real. Without --period-guess the
starting periods come from the periodogram. --double fits both stars (common gamma) and
gives the mass ratio and m sin^3 i of each.`,
  options: [
    { name: 'period-guess', type: 'number', valueName: 'D', description: 'start near this period, days (default: search the periodogram)' },
    { name: 'double', type: 'boolean', description: 'fit a double-lined binary (needs velocity2_km_s)' },
    { name: 'min-period', type: 'number', valueName: 'D', description: 'shortest period searched, days (default 0.5)' },
    { name: 'max-period', type: 'number', valueName: 'D', description: 'longest period searched, days (default: the time span)' },
    { name: 'jitter', type: 'string', valueName: 'estimate|KM_S', description: 'extra scatter added in quadrature: a value in km/s, or "estimate" (default 0)' },
  ],
  positionals: { min: 1, max: 1, name: 'TABLE' },
  async run(args, io) {
    const file = args.positionals[0];
    const jitterText = stringOption(args, 'jitter');
    let jitter: number | 'estimate' | undefined;
    if (jitterText !== undefined) {
      jitter = jitterText === 'estimate' ? 'estimate' : Number(jitterText);
      if (jitter !== 'estimate' && (jitterText.trim() === '' || !(jitter >= 0) || !Number.isFinite(jitter))) {
        throw new UsageError('cli.bad-jitter', messages.cliBadJitter(jitterText));
      }
    }
    const table = parseVelocityTable(readFileSync(resolve(io.cwd, file), 'utf8'), file, { logger: io.logger });
    const guess = numberOption(args, 'period-guess');
    const minP = numberOption(args, 'min-period');
    const maxP = numberOption(args, 'max-period');
    const fit = fitOrbit(table, {
      doubleLined: flagOption(args, 'double'),
      logger: io.logger,
      ...(guess !== undefined ? { periodGuessDays: guess } : {}),
      ...(minP !== undefined ? { minPeriodDays: minP } : {}),
      ...(maxP !== undefined ? { maxPeriodDays: maxP } : {}),
      ...(jitter !== undefined ? { jitterKmPerS: jitter } : {}),
    });
    io.stdout(args.json ? JSON.stringify(orbitJson(file, fit)) + '\n' : describe(file, table.bjdTdb.length, fit));
    return 0;
  },
};
