import { readFileSync } from 'node:fs';
import { repoPath } from '../helpers/paths.js';

/** One case of test/fixtures/barycentric-astropy.json (written by test/reference/make_barycentric_refs.py). */
export interface AstropyCase {
  time_utc: string;
  ra_deg: number;
  dec_deg: number;
  lat_deg: number;
  lon_deg: number;
  height_m: number;
  itrs_xyz_m: [number, number, number];
  jd_utc: number;
  mjd_tdb: number;
  tt_minus_utc_s: number;
  tdb_minus_tt_s: number;
  barycentric_correction_m_s: number;
  heliocentric_correction_m_s: number;
  light_travel_time_barycentric_s: number;
  light_travel_time_heliocentric_s: number;
  bjd_tdb_minus_2400000: number;
  hjd_utc_minus_2400000: number;
}

/** The whole fixture. */
export interface AstropyFixture {
  library: string;
  date: string;
  calls: Record<string, string>;
  leap_seconds_erfa: { year: number; month: number; tai_utc_s: number }[];
  leap_seconds_pre1972: { date: string; day_fraction: number; tai_utc_s: number }[];
  leap_seconds_tzdata: { source: string; expires_mjd: number; entries: { mjd: number; tai_utc_s: number }[] } | null;
  cases: AstropyCase[];
}

/** Reference values from astropy 5.2.1 (see the fixture's `library`, `calls` and `date`). */
export const astropy: AstropyFixture = JSON.parse(readFileSync(repoPath('test', 'fixtures', 'barycentric-astropy.json'), 'utf8'));

/** Worst absolute value and root-mean-square of a list of differences. */
export function worstAndRms(diffs: number[]): { worst: number; rms: number } {
  let worst = 0;
  let ss = 0;
  for (const d of diffs) {
    worst = Math.max(worst, Math.abs(d));
    ss += d * d;
  }
  return { worst, rms: Math.sqrt(ss / diffs.length) };
}
