import { resolve } from 'node:path';
import { readSpectrum } from '../../io/read.js';
import { Header } from '../../spectrum/header.js';
import { formatDeclination, formatRightAscension } from '../../velocity/coordinates.js';
import { barycentricCorrectionFromHeader, type HeaderCorrection } from '../../velocity/observation.js';
import { numberOption, type Command } from '../command.js';
import { OBSERVATION_OPTIONS, observationOverrides } from './observation-options.js';

/** What `lineshift barycentric --json` prints. */
export interface BarycentricReport {
  /** The FITS or text file whose header was read, or null. */
  file: string | null;
  /** Barycentric correction in km/s, to add to a measured velocity (c·z_B; relativistic combination). */
  barycentricCorrection: number;
  /** Heliocentric correction in km/s (classical). */
  heliocentricCorrection: number;
  /** BJD_TDB at the mid-point. */
  bjdTdb: number;
  /** HJD on the UTC scale at the mid-point. */
  hjd: number;
  hjdTimeScale: 'UTC';
  lightTravelTimeBarycentricS: number;
  lightTravelTimeHeliocentricS: number;
  /** Mid-exposure instant, ISO 8601 UTC. */
  midpoint: string;
  midpointMethod: string;
  midpointGiven: boolean;
  exposureS: number | null;
  target: { raDeg: number; decDeg: number; raHms: string; decDms: string };
  /** Longitude east positive; height above the WGS 84 ellipsoid. */
  site: { latitudeDeg: number; longitudeDeg: number; heightM: number };
  time: { jdUtc: number; jdTt: number; jdTdb: number; ttMinusUtcS: number; tdbMinusTtS: number; beyondLeapSecondTable: boolean };
  keysUsed: readonly string[];
}

/** Builds the report printed by the command. */
export function barycentricReport(c: HeaderCorrection, file: string | null): BarycentricReport {
  const o = c.observation;
  return {
    file,
    barycentricCorrection: c.barycentricCorrectionKmPerS,
    heliocentricCorrection: c.heliocentricCorrectionKmPerS,
    bjdTdb: c.bjdTdb,
    hjd: c.hjd,
    hjdTimeScale: 'UTC',
    lightTravelTimeBarycentricS: c.lightTravelTimeBarycentricS,
    lightTravelTimeHeliocentricS: c.lightTravelTimeHeliocentricS,
    midpoint: c.midpoint,
    midpointMethod: o.midpointMethod,
    midpointGiven: o.midpointGiven,
    exposureS: o.exposureS,
    target: { raDeg: o.target.raDeg, decDeg: o.target.decDeg, raHms: formatRightAscension(o.target.raDeg), decDms: formatDeclination(o.target.decDeg) },
    site: { latitudeDeg: o.site.latitudeDeg, longitudeDeg: o.site.longitudeDeg, heightM: o.site.heightM },
    time: {
      jdUtc: c.time.jdUtc, jdTt: c.time.jdTt, jdTdb: c.time.jdTdb,
      ttMinusUtcS: c.time.ttMinusUtcS, tdbMinusTtS: c.time.tdbMinusTtS, beyondLeapSecondTable: c.time.beyondLeapSecondTable,
    },
    keysUsed: c.keysUsed,
  };
}

function describe(r: BarycentricReport): string {
  const methods: Record<string, string> = {
    'given': 'given',
    'start-end': 'half-way between start and end',
    'start-exposure': 'start + exposure/2',
    'start-only': 'start (no exposure time known)',
  };
  return [
    ...(r.file ? [r.file] : []),
    `  barycentric correction: ${r.barycentricCorrection.toFixed(4)} km/s (add to a measured velocity)`,
    `  heliocentric correction: ${r.heliocentricCorrection.toFixed(4)} km/s`,
    `  BJD_TDB:   ${r.bjdTdb.toFixed(6)}`,
    `  HJD (UTC): ${r.hjd.toFixed(6)}`,
    `  mid-point: ${r.midpoint} UTC (${methods[r.midpointMethod] ?? r.midpointMethod})`,
    `  JD UTC ${r.time.jdUtc.toFixed(6)}, JD TDB ${r.time.jdTdb.toFixed(6)} (TT−UTC ${r.time.ttMinusUtcS.toFixed(3)} s)`,
    `  target:    RA ${r.target.raHms} (${r.target.raDeg.toFixed(5)}°), Dec ${r.target.decDms} (${r.target.decDeg.toFixed(5)}°)`,
    `  site:      lat ${r.site.latitudeDeg.toFixed(5)}°, lon ${r.site.longitudeDeg.toFixed(5)}° E, height ${r.site.heightM.toFixed(1)} m`,
    ...(r.keysUsed.length ? [`  header keys used: ${r.keysUsed.join(', ')}`] : []),
  ].join('\n') + '\n';
}

export const barycentricCommand: Command = {
  name: 'barycentric',
  summary: 'barycentric and heliocentric velocity corrections, BJD_TDB and HJD of an observation',
  usage: '[FILE] [--time ISO] [--ra DEG|HH:MM:SS] [--dec DEG|±DD:MM:SS] [--lat DEG] [--lon DEG] [--height M] [--exptime S] [--json]',
  description: `Computes, at the exposure mid-point, the barycentric correction (km/s, to ADD
to a measured radial velocity; positive velocities recede), the heliocentric correction,
BJD_TDB and HJD (on the UTC scale). Inputs come from the FITS header of FILE
(DATE-OBS, EXPTIME, RA/DEC or OBJCTRA/OBJCTDEC, OBSGEO-X/Y/Z or SITELAT/SITELONG/SITEELEV, ...)
and/or from the options, which override the header. --time is the exposure START in UTC;
the mid-point is --midpoint if given, else start + exposure/2. RA is degrees or hours
(hh:mm:ss.s); Dec is degrees or ±dd:mm:ss; both ICRS/J2000. Longitude is east positive.`,
  options: [
    ...OBSERVATION_OPTIONS,
    { name: 'hdu', type: 'number', valueName: 'N', description: 'FITS HDU to read the header from (0-based)' },
  ],
  positionals: { min: 0, max: 1, name: 'FILE' },
  async run(args, io) {
    const { overrides, headerLongitude } = observationOverrides(args);
    const file = args.positionals[0];
    const hdu = numberOption(args, 'hdu');
    const header = file === undefined ? Header.empty() : readSpectrum(resolve(io.cwd, file), { hdu, logger: io.logger }).header;
    const result = barycentricCorrectionFromHeader(header, overrides, {
      file, hdu, logger: io.logger, headerLongitude,
    });
    const report = barycentricReport(result, file ?? null);
    io.stdout(args.json ? JSON.stringify(report) + '\n' : describe(report));
    return 0;
  },
};
