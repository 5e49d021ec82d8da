import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { velocityPeriodogram, type Periodogram } from '../../orbit/periodogram.js';
import { parseVelocityTable } from '../../orbit/table.js';
import { numberOption, type Command } from '../command.js';

const cycleText = { day: 'daily', month: 'monthly', year: 'yearly' } as const;

function fmtP(x: number): string {
  return x >= 100 ? x.toFixed(2) : x >= 10 ? x.toFixed(3) : x.toFixed(4);
}

function fmtProb(p: number): string {
  return p >= 0.001 ? p.toFixed(3) : p.toExponential(1);
}

/** What `lineshift periodogram --json` prints. */
export function periodogramJson(file: string, pg: Periodogram): Record<string, unknown> {
  return {
    file,
    units: { period: 'd', frequency: '1/d', power: `${pg.normalization} normalisation (fraction of variance explained)` },
    pointCount: pg.pointCount,
    timeSpan: pg.timeSpanDays,
    minPeriod: pg.minPeriodDays,
    maxPeriod: pg.maxPeriodDays,
    oversampling: pg.oversampling,
    bestPeriod: pg.best.periodDays,
    bestFrequency: pg.best.frequencyPerDay,
    bestPower: pg.best.power,
    falseAlarmProbability: pg.falseAlarmProbability,
    falseAlarmBound: pg.falseAlarmBound,
    peaks: pg.peaks.map((p) => ({ period: p.periodDays, frequency: p.frequencyPerDay, power: p.power })),
    windowPeaks: pg.windowPeaks.map((w) => ({ period: w.periodDays, frequency: w.frequencyPerDay, power: w.power, cycle: w.cycle })),
    aliases: pg.aliases.map((a) => ({
      period: a.periodDays, frequency: a.frequencyPerDay, power: a.power,
      windowFrequency: a.windowFrequencyPerDay, windowCycle: a.windowCycle, sign: a.sign,
    })),
    frequency: Array.from(pg.frequencyPerDay),
    power: Array.from(pg.power),
    window: Array.from(pg.windowPower),
    provenance: pg.provenance,
  };
}

function describe(file: string, pg: Periodogram): string {
  const lines = [
    `${file}: ${pg.pointCount} velocities over ${pg.timeSpanDays.toFixed(1)} d; periods ${fmtP(pg.minPeriodDays)} to ${fmtP(pg.maxPeriodDays)} d searched (${pg.frequencyPerDay.length} frequencies)`,
    `best period: ${fmtP(pg.best.periodDays)} d (power ${pg.best.power.toFixed(3)}, false-alarm probability ${fmtProb(pg.falseAlarmProbability)})`,
  ];
  if (pg.peaks.length > 1) {
    lines.push(`next peaks: ${pg.peaks.slice(1).map((p) => `${fmtP(p.periodDays)} d (${p.power.toFixed(3)})`).join(', ')}`);
  }
  if (pg.aliases.length > 0) {
    lines.push('aliases of the best period (best frequency ± a peak of the spectral window):');
    for (const a of pg.aliases) {
      const why = a.windowCycle ? `${cycleText[a.windowCycle]} sampling` : `window peak at ${a.windowFrequencyPerDay.toFixed(4)} 1/d`;
      lines.push(`  ${a.sign > 0 ? '+' : '-'} ${why}: ${fmtP(a.periodDays)} d (power ${a.power.toFixed(3)})`);
    }
  }
  return lines.join('\n') + '\n';
}

export const periodogramCommand: Command = {
  name: 'periodogram',
  summary: 'search a velocity table for periods (generalised Lomb-Scargle) with false-alarm probability and aliases',
  usage: 'TABLE [--min-period D] [--max-period D] [--oversampling N] [--json]',
  description: `Reads a velocity table (CSV with columns bjd_tdb, velocity_km_s, uncertainty_km_s,
or JSON) and computes the generalised Lomb-Scargle periodogram with a floating mean and
weights 1/sigma^2 (Zechmeister & Kuerster 2009). Prints the best period, the false-alarm
probability of its peak (Baluev 2008; near 0 means unlikely to be noise), the next peaks,
and the aliases of the best period made by the sampling (e.g. one observation per night
makes an alias at the best frequency +/- 1 per day). Periods are in days. With --json,
also the frequency grid (1/d), the power (0-1) and the spectral window.`,
  options: [
    { name: 'min-period', type: 'number', valueName: 'D', description: 'shortest period searched, days (default 0.5)' },
    { name: 'max-period', type: 'number', valueName: 'D', description: 'longest period searched, days (default: the time span of the data)' },
    { name: 'oversampling', type: 'number', valueName: 'N', description: 'grid points per resolution element 1/T (default 10)' },
  ],
  positionals: { min: 1, max: 1, name: 'TABLE' },
  async run(args, io) {
    const file = args.positionals[0];
    const table = parseVelocityTable(readFileSync(resolve(io.cwd, file), 'utf8'), file, { logger: io.logger });
    const minP = numberOption(args, 'min-period');
    const maxP = numberOption(args, 'max-period');
    const over = numberOption(args, 'oversampling');
    const pg = velocityPeriodogram(table, {
      ...(minP !== undefined ? { minPeriodDays: minP } : {}),
      ...(maxP !== undefined ? { maxPeriodDays: maxP } : {}),
      ...(over !== undefined ? { oversampling: over } : {}),
    });
    io.stdout(args.json ? JSON.stringify(periodogramJson(file, pg)) + '\n' : describe(file, pg));
    return 0;
  },
};
