/**
 * The options that say when, where from and towards what an observation was made, shared by
 * the commands that compute barycentric corrections (`barycentric`, `velocity`).
 */
import { UsageError } from '../../errors.js';
import { parseDeclination, parseLatitude, parseLongitude, parseRightAscension } from '../../velocity/coordinates.js';
import type { ObservationOverrides } from '../../velocity/observation.js';
import { parseUtcTime } from '../../velocity/time.js';
import { numberOption, stringOption, type OptionSpec, type ParsedArgs } from '../command.js';

/** Time, target and site options (override the header). */
export const OBSERVATION_OPTIONS: readonly OptionSpec[] = Object.freeze([
  { name: 'time', type: 'string', valueName: 'ISO', description: 'exposure start, UTC, e.g. 2024-03-05T21:14:07' },
  { name: 'midpoint', type: 'string', valueName: 'ISO', description: 'exposure mid-point, UTC (overrides --time/--exptime)' },
  { name: 'exptime', type: 'number', valueName: 'S', description: 'exposure time in seconds' },
  { name: 'ra', type: 'string', valueName: 'DEG|HH:MM:SS', description: 'target right ascension (ICRS): degrees, or hours as hh:mm:ss.s' },
  { name: 'dec', type: 'string', valueName: 'DEG|±DD:MM:SS', description: 'target declination (ICRS): degrees or ±dd:mm:ss.s' },
  { name: 'lat', type: 'string', valueName: 'DEG', description: 'site latitude, degrees north (or ±dd:mm:ss)' },
  { name: 'lon', type: 'string', valueName: 'DEG', description: 'site longitude, degrees EAST (or ±ddd:mm:ss)' },
  { name: 'height', type: 'number', valueName: 'M', description: 'site height above the WGS 84 ellipsoid, metres' },
  { name: 'header-longitude', type: 'string', valueName: 'east|west', description: 'sign convention of longitude cards in the header (default east)' },
] as const);

/**
 * The overrides given on the command line, parsed.
 * @throws {UsageError} `cli.missing-option` when only one of --ra/--dec is given, `cli.bad-choice` for --header-longitude.
 * @throws {InputError} for values that are not times or angles (naming the option).
 */
export function observationOverrides(args: ParsedArgs): { overrides: ObservationOverrides; headerLongitude: 'east' | 'west' | undefined } {
  const overrides: ObservationOverrides = {};
  const time = stringOption(args, 'time');
  if (time !== undefined) overrides.start = parseUtcTime(time, { keyword: '--time' });
  const midpoint = stringOption(args, 'midpoint');
  if (midpoint !== undefined) overrides.midpoint = parseUtcTime(midpoint, { keyword: '--midpoint' });
  const exptime = numberOption(args, 'exptime');
  if (exptime !== undefined) overrides.exposureS = exptime;
  const ra = stringOption(args, 'ra');
  const dec = stringOption(args, 'dec');
  if ((ra === undefined) !== (dec === undefined)) throw new UsageError('cli.missing-option', '--ra and --dec go together');
  if (ra !== undefined && dec !== undefined) {
    overrides.target = { raDeg: parseRightAscension(ra, { keyword: '--ra' }), decDeg: parseDeclination(dec, { keyword: '--dec' }) };
  }
  const lat = stringOption(args, 'lat');
  if (lat !== undefined) overrides.latitudeDeg = parseLatitude(lat, { keyword: '--lat' });
  const lon = stringOption(args, 'lon');
  if (lon !== undefined) overrides.longitudeDeg = parseLongitude(lon, { keyword: '--lon' });
  const height = numberOption(args, 'height');
  if (height !== undefined) overrides.heightM = height;
  const convention = stringOption(args, 'header-longitude');
  if (convention !== undefined && convention !== 'east' && convention !== 'west') {
    throw new UsageError('cli.bad-choice', `--header-longitude must be east or west, got "${convention}"`);
  }
  return { overrides, headerLongitude: convention as 'east' | 'west' | undefined };
}
