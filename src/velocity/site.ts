/**
 * Observing sites: geodetic latitude, longitude (east positive) and height on the WGS 84
 * ellipsoid, and their geocentric Cartesian (ITRS) form as FITS OBSGEO-X/Y/Z give it.
 */
import { InputError, type ErrorLocation } from '../errors.js';
import { WGS84_FLATTENING, WGS84_SEMI_MAJOR_AXIS_M } from './constants.js';
import { normalizeLongitudeDeg } from './coordinates.js';

/** An observing site on the Earth. */
export interface ObservingSite {
  /** Geodetic latitude, degrees, north positive, −90..+90 (WGS 84). */
  readonly latitudeDeg: number;
  /** Longitude, degrees, EAST positive, −180 < λ ≤ 180. */
  readonly longitudeDeg: number;
  /** Height above the WGS 84 ellipsoid, metres (−1 000 to 100 000 accepted). */
  readonly heightM: number;
}

/** Geocentric Cartesian coordinates in the ITRS (Earth-fixed), metres: [x, y, z]. */
export type GeocentricMeters = readonly [x: number, y: number, z: number];

const E2 = WGS84_FLATTENING * (2 - WGS84_FLATTENING);

/**
 * Checks and normalises a site (longitude folded into −180..180).
 *
 * @throws {InputError} `site.out-of-range` for a latitude outside ±90°, a height outside
 *   −1 km..100 km, or a value that is not finite.
 * @example
 * makeSite(52.1, 359, 40); // { latitudeDeg: 52.1, longitudeDeg: -1, heightM: 40 }
 */
export function makeSite(latitudeDeg: number, longitudeDeg: number, heightM: number, where: ErrorLocation = {}): ObservingSite {
  if (!Number.isFinite(latitudeDeg) || Math.abs(latitudeDeg) > 90) throw new InputError('site.out-of-range', `latitude ${latitudeDeg} is outside -90..+90 degrees`, where);
  if (!Number.isFinite(longitudeDeg) || Math.abs(longitudeDeg) > 360) throw new InputError('site.out-of-range', `longitude ${longitudeDeg} is outside -360..+360 degrees`, where);
  if (!Number.isFinite(heightM) || heightM < -1000 || heightM > 100_000) throw new InputError('site.out-of-range', `height ${heightM} m is outside -1000..100000 m`, where);
  return { latitudeDeg, longitudeDeg: normalizeLongitudeDeg(longitudeDeg), heightM };
}

/**
 * Geocentric ITRS coordinates of a geodetic site on the WGS 84 ellipsoid.
 *
 * Method: x = (N + h) cos φ cos λ, y = (N + h) cos φ sin λ, z = (N(1 − e²) + h) sin φ, with
 * N = a/√(1 − e² sin² φ) (standard geodesy, e.g. NIMA TR8350.2 §4).
 *
 * @returns [x, y, z] in metres.
 * @example
 * geocentricFromSite({ latitudeDeg: 0, longitudeDeg: 0, heightM: 0 }); // [6378137, 0, 0]
 */
export function geocentricFromSite(site: ObservingSite): GeocentricMeters {
  const phi = (site.latitudeDeg * Math.PI) / 180;
  const lam = (site.longitudeDeg * Math.PI) / 180;
  const s = Math.sin(phi);
  const n = WGS84_SEMI_MAJOR_AXIS_M / Math.sqrt(1 - E2 * s * s);
  const r = (n + site.heightM) * Math.cos(phi);
  return [r * Math.cos(lam), r * Math.sin(lam), (n * (1 - E2) + site.heightM) * s];
}

/**
 * Geodetic site of geocentric ITRS coordinates (inverse of {@link geocentricFromSite}).
 *
 * Method: fixed-point iteration on the latitude, converged to 1e−12 rad (< 0.01 mm).
 *
 * @param xyz [x, y, z] metres (FITS OBSGEO-X/Y/Z), distance from the centre 6 000..6 500 km.
 * @throws {InputError} `site.out-of-range` when the point is not near the Earth's surface.
 * @example
 * siteFromGeocentric([6378137, 0, 0]); // { latitudeDeg: 0, longitudeDeg: 0, heightM: 0 }
 */
export function siteFromGeocentric(xyz: GeocentricMeters, where: ErrorLocation = {}): ObservingSite {
  const [x, y, z] = xyz;
  const r = Math.hypot(x, y, z);
  if (!Number.isFinite(r) || r < 6_250_000 || r > 6_500_000) {
    throw new InputError('site.out-of-range', `geocentric position (${x}, ${y}, ${z}) m is not near the Earth's surface (distance from the centre ${Number.isFinite(r) ? (r / 1000).toFixed(1) + ' km' : r}; expected metres)`, where);
  }
  const p = Math.hypot(x, y);
  const lon = Math.atan2(y, x);
  let lat = Math.atan2(z, p * (1 - E2));
  let h = 0;
  for (let i = 0; i < 20; i++) {
    const s = Math.sin(lat);
    const n = WGS84_SEMI_MAJOR_AXIS_M / Math.sqrt(1 - E2 * s * s);
    h = Math.abs(Math.cos(lat)) > 1e-9 ? p / Math.cos(lat) - n : Math.abs(z) - n * (1 - E2);
    const next = Math.atan2(z, p * (1 - (E2 * n) / (n + h)));
    const done = Math.abs(next - lat) < 1e-12;
    lat = next;
    if (done) break;
  }
  const s = Math.sin(lat);
  const n = WGS84_SEMI_MAJOR_AXIS_M / Math.sqrt(1 - E2 * s * s);
  h = Math.abs(Math.cos(lat)) > 0.5 ? p / Math.cos(lat) - n : z / s - n * (1 - E2);
  return { latitudeDeg: (lat * 180) / Math.PI, longitudeDeg: normalizeLongitudeDeg((lon * 180) / Math.PI), heightM: h };
}
