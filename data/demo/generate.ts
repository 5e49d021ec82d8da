/**
 * Makes the INVENTED demo data in data/demo/ from data/demo/scenario.json: a season of
 * spectra of the fictional binary LVAC-7 with a neon-argon lamp before and after each star
 * exposure, one low-resolution spectrum of the fictional star LVAC-12 with its lamp, one
 * deliberately damaged file, and truth.json, the values the data were made from.
 * Seeded: the same bytes every run.
 *
 *     npx tsx data/demo/generate.ts            # writes into data/demo/
 *     npx tsx data/demo/generate.ts OUT_DIR    # writes elsewhere (test/demo/generate.test.ts)
 *
 * What is real and what is invented:
 * - real: rest wavelengths (data/linelists/, NIST; their SOURCES.md), laboratory relative
 *   intensities of the lamp lines (NIST Handbook scale, per element), the Planck law, the
 *   grating equation, the Earth's motion (the library's barycentric correction), Kepler's
 *   equation;
 * - invented: the club, site, observers, telescope, stars, orbit, dates, weather, the line
 *   strengths of the stars (rough solar-like values from memory for LVAC-12, A-star-like
 *   ones for LVAC-7), the instrument's response and drifts, and the extinction law.
 *
 * How each frame is made (DEVELOPERS.md "The demo" has the same in prose):
 * 1. Wavelength of every pixel from the grating equation (src/calibrate/grating.ts) of that
 *    frame's set-up: the scenario's geometry with the camera fixed, the grating's incidence
 *    angle re-set each night (normal scatter `nightlyIncidenceSigmaDeg`) and the camera
 *    axis drifting linearly in time during the night (flexure, `flexurePixelsPerHourSigma`).
 * 2. A noise-free model on those wavelengths with `syntheticSpectrum` (src/lines/synthetic.ts):
 *    lines at rest (air) wavelengths, Doppler-shifted, blurred to the set-up's resolving
 *    power, integrated over the pixels. Stars: Planck continuum; Doppler shift = the true
 *    velocity in the observer's frame (topocentric) at mid-exposure, from the true
 *    barycentric velocity (LVAC-7: the Keplerian orbit at BJD_TDB) and the barycentric
 *    correction z_B of the library: 1 + z_topo = (1 + z_bary)/(1 + z_B), the inverse of
 *    the relativistic combination the pipeline applies. Telluric O2 bands (LVAC-12) stay at
 *    rest. Stars are multiplied by an instrument response and atmospheric extinction at
 *    the frame's airmass. Lamps: emission lines with Handbook intensities (lines without a
 *    Handbook value at a faint level), on faint scattered light.
 * 3. Counts: scaled to ADU, photon noise from the expected electrons plus read noise
 *    (seeded normal deviates), clipped at the saturation level (flat tops), written as
 *    float32 on a 0-based pixel axis with an uncertainty extension computed from the noisy
 *    counts (as a reduction would), and header cards a newcomer would expect.
 */
import { mkdirSync, readFileSync } from 'node:fs';
import { dirname, join, relative, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { Body, Equator, Horizon, Observer } from 'astronomy-engine';
import { diffractionAngleDeg, gratingPixelToWavelength, type SlitSpectrographSetup } from '../../src/calibrate/grating.js';
import { writeFileAtomic } from '../../src/io/atomic-write.js';
import { encodeFitsSpectrum } from '../../src/io/fits/write.js';
import { loadLineList, type LineEntry } from '../../src/lines/linelist.js';
import { syntheticSpectrum, type SyntheticLine } from '../../src/lines/synthetic.js';
import { normalGenerator, uniformGenerator } from '../../src/math/random.js';
import { radialVelocityKmPerS, type KeplerianOrbit } from '../../src/orbit/keplerian.js';
import { SPEED_OF_LIGHT_KM_PER_S } from '../../src/spectrum/constants.js';
import { Header, type HeaderCard } from '../../src/spectrum/header.js';
import { createSpectrum } from '../../src/spectrum/spectrum.js';
import { barycentricCorrection } from '../../src/velocity/barycentric.js';
import { makeSite, type ObservingSite } from '../../src/velocity/site.js';
import { addSeconds, formatUtcTime, mjdUtcOf, utcFromCalendar, utcFromMjd, type UtcTime } from '../../src/velocity/time.js';

const HERE = dirname(fileURLToPath(import.meta.url));

/** The scenario file (data/demo/scenario.json), as far as the generator reads it. */
export interface Scenario {
  club: string;
  site: { name: string; latitudeDeg: number; longitudeDegEast: number; heightM: number };
  observers: string[];
  telescope: string;
  instrument: {
    name: string; linesPerMm: number; order: number; incidenceDeg: number; focalLengthMm: number; pixelSizeUm: number; pixels: number;
    centralWavelengthAngstrom: number; slitFwhmPixels: number; readNoiseElectrons: number; gainElectronsPerAdu: number; saturationAdu: number;
    nightlyIncidenceSigmaDeg: number; flexurePixelsPerHourSigma: number; responseCentreAngstrom: number; responseWidthAngstrom: number;
  };
  lamp: LampScenario & { gapAfterStarSeconds: number };
  binary: {
    name: string; raDeg: number; decDeg: number; effectiveTemperatureK: number; projectedRotationKmPerS: number;
    orbit: KeplerianOrbit;
    season: { firstNightUtc: string; lastNightUtc: string; nights: number; exposureSeconds: number; peakSignalToNoise: [number, number]; minimumAltitudeDeg: number; sunBelowDeg: number };
    damagedNightUtc: string;
  };
  identificationStar: {
    name: string; raDeg: number; decDeg: number; effectiveTemperatureK: number; radialVelocityKmPerS: number; nightUtc: string; exposureSeconds: number;
    peakSignalToNoise: number; resolvingPower: number; wavelengthRangeAngstrom: [number, number];
    instrument: { description: string; linesPerMm: number; order: number; incidenceDeg: number; focalLengthMm: number; pixelSizeUm: number; pixels: number; centralWavelengthAngstrom: number };
    lamp: LampScenario;
  };
  seed: number;
}

interface LampScenario {
  lamp: string;
  species: string[];
  exposureSeconds: number;
  peakAduPerIntensity: Record<string, number>;
  intensityWithoutHandbookValue: Record<string, number>;
  scatteredLightAdu: number;
  gapBeforeStarSeconds: number;
}

/** The true dispersion of one frame: the exact set-up and λ at every 256th pixel (Å, air). */
export interface TrueDispersion {
  setup: SlitSpectrographSetup;
  /** λ (Å, air) at pixels 0, 256, …, 1792 and the last pixel, for a quick look; recompute exactly with gratingPixelToWavelength(setup, p). */
  sampleWavelengthsAngstrom: { pixel: number; wavelengthAngstrom: number }[];
}

/** One LVAC-7 night in truth.json. */
export interface TrueExposure {
  night: string;
  damaged: boolean;
  files: { lampBefore: string; star: string; lampAfter: string };
  observer: string;
  dateObs: string;
  exposureSeconds: number;
  midpointUtc: string;
  bjdTdb: number;
  barycentricCorrectionKmPerS: number;
  /** The orbit's velocity at BJD_TDB: the barycentric radial velocity the pipeline should recover. */
  barycentricVelocityKmPerS: number;
  /** The velocity in the observer's frame the spectrum was shifted by. */
  topocentricVelocityKmPerS: number;
  airmass: number;
  peakSignalToNoise: number;
  incidenceOffsetDeg: number;
  flexurePixelsPerHour: number;
  dispersion: { lampBefore: TrueDispersion; star: TrueDispersion; lampAfter: TrueDispersion };
}

/** truth.json. */
export interface DemoTruth {
  note: string;
  generator: string;
  scenario: string;
  orbit: KeplerianOrbit;
  site: ObservingSite;
  exposures: TrueExposure[];
  lvac12: {
    files: { lamp: string; star: string };
    dateObs: string; midpointUtc: string; bjdTdb: number; barycentricCorrectionKmPerS: number;
    barycentricVelocityKmPerS: number; topocentricVelocityKmPerS: number; airmass: number; resolvingPower: number;
    composition: { species: string; lines: number }[];
    telluric: string[];
    dispersion: { lamp: TrueDispersion; star: TrueDispersion };
  };
  damagedFile: { file: string; bytesKept: number; bytesOriginal: number; why: string };
}

const INVENTED_CARDS: HeaderCard[] = [
  { keyword: 'COMMENT', text: 'INVENTED demo data for lineshift: not an observation. The Larkspur' },
  { keyword: 'COMMENT', text: 'Valley Astronomy Club, its site, observers, telescope and the stars' },
  { keyword: 'COMMENT', text: 'LVAC-7 and LVAC-12 are fictional. Made by data/demo/generate.ts' },
  { keyword: 'COMMENT', text: 'from data/demo/scenario.json (seeded); truth in data/demo/truth.json.' },
];

// ---------------------------------------------------------------------------------------------
// Small helpers

/** Relativistic Doppler factor 1 + z of a velocity (km/s, positive receding). */
function dopplerFactor(vKmPerS: number): number {
  const b = vKmPerS / SPEED_OF_LIGHT_KM_PER_S;
  return Math.sqrt((1 + b) / (1 - b));
}

/** Velocity (km/s) of a relativistic Doppler factor 1 + z. */
function velocityOfFactor(f: number): number {
  const f2 = f * f;
  return (SPEED_OF_LIGHT_KM_PER_S * (f2 - 1)) / (f2 + 1);
}

/**
 * The velocity in the observer's frame whose combination with the barycentric correction
 * gives `barycentric`: 1 + z_topo = (1 + z_bary)/(1 + z_B), z_B = correction/c (the
 * add-to-measured convention of `barycentricCorrection` and `applyVelocityCorrection`).
 */
export function topocentricVelocityKmPerS(barycentricKmPerS: number, correctionKmPerS: number): number {
  return velocityOfFactor(dopplerFactor(barycentricKmPerS) / (1 + correctionKmPerS / SPEED_OF_LIGHT_KM_PER_S));
}

function parseDate(s: string): [number, number, number] {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(s);
  if (!m) throw new Error(`scenario: bad date ${s}`);
  return [Number(m[1]), Number(m[2]), Number(m[3])];
}

function isoDate(utc: UtcTime): string {
  return formatUtcTime(utc, 0).slice(0, 10);
}

/** A JS Date for astronomy-engine (UTC; leap seconds do not matter for altitudes). */
function jsDate(utc: UtcTime): Date {
  return new Date(Date.UTC(1858, 10, 17) + (utc.mjdDay * 86400 + utc.secondsOfDay) * 1000);
}

function round(x: number, digits: number): number {
  const f = 10 ** digits;
  return Math.round(x * f) / f;
}

// ---------------------------------------------------------------------------------------------
// Sky: when a star can be observed, and through how much air

interface Sky {
  observer: Observer;
  altitudeDeg(utc: UtcTime, raDeg: number, decDeg: number): number;
  sunAltitudeDeg(utc: UtcTime): number;
}

function sky(site: ObservingSite): Sky {
  const observer = new Observer(site.latitudeDeg, site.longitudeDeg, site.heightM);
  return {
    observer,
    altitudeDeg: (utc, raDeg, decDeg) => Horizon(jsDate(utc), observer, raDeg / 15, decDeg, 'normal').altitude,
    sunAltitudeDeg: (utc) => {
      const d = jsDate(utc);
      const eq = Equator(Body.Sun, d, observer, true, true);
      return Horizon(d, observer, eq.ra, eq.dec, 'normal').altitude;
    },
  };
}

/** Plane-parallel airmass sec z, adequate above 30° altitude (common practice). */
function airmass(altitudeDeg: number): number {
  return 1 / Math.sin((altitudeDeg * Math.PI) / 180);
}

/**
 * The start (UTC, whole seconds) of a sequence of `lengthS` seconds during the night that
 * ends on the morning of `date` (UTC 00:00 to 13:00, local evening before to dawn), with the
 * Sun below `sunBelowDeg` and the star above `minAltitudeDeg` throughout; chosen at random
 * among the 5-minute steps that qualify. Null when there is none.
 */
function sequenceStart(s: Sky, date: string, lengthS: number, raDeg: number, decDeg: number, minAltitudeDeg: number, sunBelowDeg: number, u: () => number): UtcTime | null {
  const [y, m, d] = parseDate(date);
  const candidates: UtcTime[] = [];
  for (let minute = 0; minute <= 13 * 60; minute += 5) {
    const start = utcFromCalendar(y, m, d, Math.floor(minute / 60), minute % 60, 0);
    let ok = true;
    for (const dt of [0, lengthS / 2, lengthS]) {
      const t = addSeconds(start, dt);
      if (s.sunAltitudeDeg(t) > sunBelowDeg || s.altitudeDeg(t, raDeg, decDeg) < minAltitudeDeg) {
        ok = false;
        break;
      }
    }
    if (ok) candidates.push(start);
  }
  if (candidates.length === 0) return null;
  const chosen = candidates[Math.floor(u() * candidates.length)];
  return addSeconds(chosen, Math.floor(u() * 240));
}

// ---------------------------------------------------------------------------------------------
// Line lists of the stars and lamps

/** An air rest wavelength from the shipped list (exactly as listed), or an error naming the line. */
function listed(species: string, approximateAngstrom: number): number {
  const entries = loadLineList(species).entries;
  let best: LineEntry | undefined;
  for (const e of entries) if (!best || Math.abs(e.wavelengthAngstrom - approximateAngstrom) < Math.abs(best.wavelengthAngstrom - approximateAngstrom)) best = e;
  if (!best || Math.abs(best.wavelengthAngstrom - approximateAngstrom) > 0.5) throw new Error(`generator: no ${species} line near ${approximateAngstrom} Å in data/linelists`);
  return best.wavelengthAngstrom;
}

/**
 * LVAC-7 (invented A-type-like star, 9200 K): Hα with broad (Stark-like, Lorentzian) wings,
 * Si II 6347/6371 and Fe II lines of the 6200–6600 Å range. Depths and widths are invented,
 * A-star-like; the widths include rotation (v sin i from the scenario, as a Gaussian of FWHM
 * √3·v sin i·λ/c, a rough stand-in for the rotational profile).
 */
export function lvac7Lines(vsiniKmPerS: number): SyntheticLine[] {
  const rot = (l: number) => (Math.sqrt(3) * vsiniKmPerS * l) / SPEED_OF_LIGHT_KM_PER_S;
  const metal = (species: string, l: number, depth: number): SyntheticLine => {
    const w = listed(species, l);
    return { wavelengthAngstrom: w, medium: 'air', depth, fwhmAngstrom: rot(w), species };
  };
  return [
    { wavelengthAngstrom: listed('H I', 6562.8), medium: 'air', depth: 0.56, fwhmAngstrom: 3.2, fwhmLorentzianAngstrom: 9.5, profile: 'voigt', species: 'H I' },
    metal('Si II', 6347.1, 0.2), metal('Si II', 6371.36, 0.15),
    metal('Fe II', 6238.39, 0.06), metal('Fe II', 6247.56, 0.09), metal('Fe II', 6416.92, 0.06),
    metal('Fe II', 6432.68, 0.06), metal('Fe II', 6456.38, 0.1), metal('Fe II', 6516.08, 0.08),
  ];
}

/**
 * LVAC-12 (invented solar-type star, 5800 K): equivalent widths of strong lines, rough
 * solar values recalled from memory (not a model atmosphere; at R ≈ 900 only their sum
 * per blend shows). Strong lines get Voigt wings so that their intrinsic depth stays ≤ 0.85.
 */
const LVAC12_LINES: readonly (readonly [species: string, wavelengthAngstrom: number, equivalentWidthAngstrom: number])[] = [
  ['H I', 6562.8, 4.0], ['H I', 4861.3, 3.6], ['H I', 4340.46, 2.9], ['H I', 4101.74, 3.0], ['H I', 3970.07, 2.0],
  ['Ca II', 3933.66, 18], ['Ca II', 3968.47, 13],
  ['Ca I', 4226.73, 1.5], ['Ca I', 6162.17, 0.22], ['Ca I', 6122.22, 0.22], ['Ca I', 6102.72, 0.14], ['Ca I', 6439.07, 0.16], ['Ca I', 4454.78, 0.2],
  ['Ca I', 5588.76, 0.17], ['Ca I', 6493.78, 0.12], ['Ca I', 4434.96, 0.15], ['Ca I', 4425.44, 0.15],
  ['Mg I', 5183.6, 1.6], ['Mg I', 5172.68, 1.26], ['Mg I', 5167.32, 0.93], ['Mg I', 5528.4, 0.29], ['Mg I', 4702.99, 0.33],
  ['Na I', 5889.95, 0.75], ['Na I', 5895.92, 0.56],
  ['Fe I', 4045.81, 1.2], ['Fe I', 4063.59, 0.79], ['Fe I', 4071.74, 0.72], ['Fe I', 4383.54, 1.0], ['Fe I', 4404.75, 0.9],
  ['Fe I', 4325.76, 0.8], ['Fe I', 4271.76, 0.76], ['Fe I', 4957.6, 0.7], ['Fe I', 5269.54, 0.48], ['Fe I', 5328.04, 0.38],
  ['Fe I', 5371.49, 0.3], ['Fe I', 5405.77, 0.27], ['Fe I', 5429.7, 0.3], ['Fe I', 5446.92, 0.24], ['Fe I', 5455.61, 0.2],
  ['Fe I', 4920.5, 0.43], ['Fe I', 5227.15, 0.3], ['Fe I', 4890.75, 0.3], ['Fe I', 4891.49, 0.3], ['Fe I', 5232.94, 0.35],
  ['Fe I', 5266.56, 0.26], ['Fe I', 5324.18, 0.3], ['Fe I', 5397.13, 0.25], ['Fe I', 5615.64, 0.2], ['Fe I', 5586.76, 0.18],
  ['Fe I', 6191.56, 0.13], ['Fe I', 6230.72, 0.16], ['Fe I', 6252.55, 0.12], ['Fe I', 6393.6, 0.13], ['Fe I', 6494.98, 0.15],
  ['Fe I', 4143.87, 0.5], ['Fe I', 4132.06, 0.4], ['Fe I', 4260.47, 0.5], ['Fe I', 4307.9, 0.7], ['Fe I', 4528.61, 0.16],
  ['Fe II', 4923.92, 0.18], ['Fe II', 5018.44, 0.2], ['Fe II', 5169.03, 0.25], ['Fe II', 5316.61, 0.14],
];

function lvac12Lines(): SyntheticLine[] {
  return LVAC12_LINES.map(([species, approx, ew]) => {
    const w = listed(species, approx);
    const broad = species === 'H I' || species === 'Ca II';
    const gaussianFwhm = broad ? 1.2 : 0.12;
    // Depth of a Gaussian with this EW; above 0.85 the line gets Lorentzian wings that carry the rest.
    const gaussianArea = gaussianFwhm * Math.sqrt(Math.PI / (4 * Math.LN2));
    if (ew / gaussianArea <= 0.85) return { wavelengthAngstrom: w, medium: 'air', equivalentWidthAngstrom: ew, fwhmAngstrom: gaussianFwhm, species };
    // Lorentzian area π/2·w dominates: choose w so that a depth of 0.85 gives the EW (approximately; the EW is what is asked).
    const lorentz = Math.max(0.05, (ew / 0.85 - gaussianArea * 0.5) / (Math.PI / 2));
    return { wavelengthAngstrom: w, medium: 'air', equivalentWidthAngstrom: ew, fwhmAngstrom: gaussianFwhm, fwhmLorentzianAngstrom: lorentz, profile: 'voigt', species };
  });
}

/**
 * Telluric O2 bands in LVAC-12's range, invented line by line but placed inside the band
 * limits of data/linelists/O2_telluric.csv: the B band from its head at 6867.19 Å redward
 * to 6884 Å, and the weak band at 6276–6287 Å. Spacing and strengths are invented.
 */
function telluricLines(): SyntheticLine[] {
  const out: SyntheticLine[] = [];
  for (let k = 0; k < 16; k++) out.push({ wavelengthAngstrom: 6867.19 + 1.1 * k, medium: 'air', depth: k < 2 ? 0.8 : 0.6, fwhmAngstrom: 0.25, species: 'O2' });
  for (let k = 0; k < 6; k++) out.push({ wavelengthAngstrom: 6276.8 + 1.8 * k, medium: 'air', depth: 0.25, fwhmAngstrom: 0.2, species: 'O2' });
  return out;
}

/** Lamp lines between two wavelengths, with Handbook intensities (or the scenario's faint level where the list has none). */
function lampLines(lamp: LampScenario, lo: number, hi: number): { wavelengthAngstrom: number; species: string; peakAdu: number }[] {
  const out: { wavelengthAngstrom: number; species: string; peakAdu: number }[] = [];
  for (const species of lamp.species) {
    for (const e of loadLineList(species).entries) {
      if (e.wavelengthAngstrom < lo - 20 || e.wavelengthAngstrom > hi + 20) continue;
      const intensity = e.relativeIntensity ?? lamp.intensityWithoutHandbookValue[species];
      out.push({ wavelengthAngstrom: e.wavelengthAngstrom, species, peakAdu: intensity * lamp.peakAduPerIntensity[species] });
    }
  }
  return out;
}

// ---------------------------------------------------------------------------------------------
// Frames

interface Camera {
  gainElectronsPerAdu: number;
  readNoiseElectrons: number;
  saturationAdu: number;
}

/** Photon + read noise on a model in ADU, seeded; clipped at saturation. Returns flux and the uncertainty a reduction would estimate from the noisy counts. */
function expose(modelAdu: Float64Array, camera: Camera, seed: number): { flux: Float64Array; uncertainty: Float64Array } {
  const g = camera.gainElectronsPerAdu;
  const rn = camera.readNoiseElectrons;
  const normal = normalGenerator(seed);
  const flux = new Float64Array(modelAdu.length);
  const uncertainty = new Float64Array(modelAdu.length);
  for (let i = 0; i < modelAdu.length; i++) {
    const electrons = Math.max(0, modelAdu[i] * g);
    const f = modelAdu[i] + (Math.sqrt(electrons + rn * rn) / g) * normal();
    flux[i] = Math.min(camera.saturationAdu, f);
    uncertainty[i] = Math.sqrt(Math.max(0, flux[i] * g) + rn * rn) / g;
  }
  return { flux, uncertainty };
}

function pixelWavelengths(setup: SlitSpectrographSetup): Float64Array {
  const n = setup.pixels!;
  const w = new Float64Array(n);
  for (let p = 0; p < n; p++) w[p] = gratingPixelToWavelength(setup, p);
  return w;
}

function trueDispersion(setup: SlitSpectrographSetup): TrueDispersion {
  const n = setup.pixels!;
  const pixels = [0, 256, 512, 768, 1024, 1280, 1536, 1792, n - 1];
  return { setup, sampleWavelengthsAngstrom: pixels.map((p) => ({ pixel: p, wavelengthAngstrom: round(gratingPixelToWavelength(setup, p), 6) })) };
}

/** Resolving power λ/FWHM of a slit image of `slitPixels` at the middle of the set-up. */
function resolvingPowerOf(setup: SlitSpectrographSetup, slitPixels: number): number {
  const mid = (setup.pixels! - 1) / 2;
  const disp = gratingPixelToWavelength(setup, mid + 0.5) - gratingPixelToWavelength(setup, mid - 0.5);
  return gratingPixelToWavelength(setup, mid) / (slitPixels * disp);
}

/** Response of the invented instrument (blaze and detector) × atmospheric transmission at an airmass. */
function throughput(scenario: Scenario, wavelengthAngstrom: number, airmassValue: number): number {
  const { responseCentreAngstrom: c, responseWidthAngstrom: w } = scenario.instrument;
  const response = Math.exp(-0.5 * ((wavelengthAngstrom - c) / w) ** 2);
  // Invented extinction law, mag per airmass: Rayleigh-like λ⁻⁴ term plus a grey part (a high, dry site).
  const k = 0.016 + 0.1 * (5000 / wavelengthAngstrom) ** 4;
  return response * 10 ** (-0.4 * k * airmassValue);
}

interface FrameCards {
  object: string;
  frameType: 'object' | 'lamp';
  start: UtcTime;
  exposureS: number;
  observer: string;
  instrumentNote: string;
  target?: { raDeg: number; decDeg: number };
  airmass?: number;
  lamp?: string;
}

function frameHeader(scenario: Scenario, c: FrameCards): Header {
  const cards: HeaderCard[] = [
    { keyword: 'OBJECT', value: c.object, comment: c.frameType === 'lamp' ? 'calibration lamp (invented)' : 'target (invented star)' },
    { keyword: 'IMAGETYP', value: c.frameType, comment: 'frame type: object (star) or lamp' },
    { keyword: 'DATE-OBS', value: formatUtcTime(c.start, 0).replace(/\.0*$/, ''), comment: 'UTC exposure start (invented)' },
    { keyword: 'EXPTIME', value: c.exposureS, comment: '[s] exposure time' },
  ];
  if (c.target) {
    cards.push(
      { keyword: 'RA', value: c.target.raDeg, comment: '[deg] target right ascension, ICRS (invented star)' },
      { keyword: 'DEC', value: c.target.decDeg, comment: '[deg] target declination, ICRS (invented star)' },
      { keyword: 'RADESYS', value: 'ICRS', comment: 'frame of RA and DEC' },
    );
  }
  if (c.airmass !== undefined) cards.push({ keyword: 'AIRMASS', value: round(c.airmass, 4), comment: 'sec(z) at mid-exposure' });
  if (c.lamp) cards.push({ keyword: 'LAMP', value: c.lamp, comment: 'lamp gases' });
  cards.push(
    { keyword: 'SITELAT', value: scenario.site.latitudeDeg, comment: '[deg] site latitude, north positive (invented site)' },
    { keyword: 'SITELONG', value: scenario.site.longitudeDegEast, comment: '[deg] site longitude, EAST positive' },
    { keyword: 'SITEELEV', value: scenario.site.heightM, comment: '[m] site height above the WGS 84 ellipsoid' },
    { keyword: 'OBSERVER', value: c.observer, comment: 'invented observer' },
    { keyword: 'TELESCOP', value: scenario.telescope },
    { keyword: 'INSTRUME', value: scenario.instrument.name },
    { keyword: 'SETUP', value: c.instrumentNote, comment: 'grating and centre (invented set-up)' },
    { keyword: 'GAIN', value: scenario.instrument.gainElectronsPerAdu, comment: '[e-/ADU]' },
    { keyword: 'RDNOISE', value: scenario.instrument.readNoiseElectrons, comment: '[e-] read noise' },
    { keyword: 'SATURATE', value: scenario.instrument.saturationAdu, comment: '[ADU] saturation level' },
    ...INVENTED_CARDS,
  );
  return Header.from(cards);
}

/** Encodes a frame (0-based pixel axis, float32, uncertainty extension); no provenance, so that the bytes do not depend on the library version. */
function frameBytes(flux: Float64Array, uncertainty: Float64Array, header: Header): Uint8Array {
  const s = createSpectrum({
    wavelength: Float64Array.from({ length: flux.length }, (_, i) => i),
    flux,
    uncertainty,
    unit: 'pixel',
    fluxUnit: 'adu',
    header,
    provenance: [],
  });
  return encodeFitsSpectrum(s, { dataType: 'float32' });
}

function lampModel(setup: SlitSpectrographSetup, lamp: LampScenario, resolvingPower: number): Float64Array {
  const wl = pixelWavelengths(setup);
  const fwhmA = (l: number) => l / resolvingPower;
  const scattered = lamp.scatteredLightAdu;
  const lines: SyntheticLine[] = lampLines(lamp, wl[0], wl[wl.length - 1]).map((l) => ({
    wavelengthAngstrom: l.wavelengthAngstrom, medium: 'air', kind: 'emission',
    // Blurred to a Gaussian of FWHM λ/R, a line of this equivalent width (continuum units) peaks at about peakAdu above the scattered light.
    equivalentWidthAngstrom: (l.peakAdu / scattered) * fwhmA(l.wavelengthAngstrom) * Math.sqrt(Math.PI / (4 * Math.LN2)),
    fwhmAngstrom: 0.05, species: l.species,
  }));
  const m = syntheticSpectrum({ wavelengthAngstrom: wl, medium: 'air', lines, continuum: { shape: 'flat', level: scattered }, resolvingPower });
  return m.model;
}

function starModel(setup: SlitSpectrographSetup, lines: SyntheticLine[], telluric: SyntheticLine[], temperatureK: number, velocityKmPerS: number,
  resolvingPower: number, throughputAt: (l: number) => number, peakAdu: number): Float64Array {
  const wl = pixelWavelengths(setup);
  const star = syntheticSpectrum({ wavelengthAngstrom: wl, medium: 'air', lines, continuum: { shape: 'planck', temperatureK }, velocityKmPerS, resolvingPower }).model;
  const tell = telluric.length ? syntheticSpectrum({ wavelengthAngstrom: wl, medium: 'air', lines: telluric, resolvingPower }).model : null;
  const out = new Float64Array(wl.length);
  let top = 0;
  for (let i = 0; i < wl.length; i++) {
    out[i] = star[i] * throughputAt(wl[i]) * (tell ? tell[i] : 1);
    top = Math.max(top, out[i]);
  }
  for (let i = 0; i < wl.length; i++) out[i] *= peakAdu / top;
  return out;
}

// ---------------------------------------------------------------------------------------------
// LVAC-7's set-up and star frame (exported for the checks of the generator against its truth)

/**
 * LVAC-7's nominal set-up: the camera fixed at the angle that puts the central wavelength on
 * its axis (the middle pixel) at the nominal incidence. Each frame's set-up in truth.json is
 * this with the night's incidence and the flexure's axis pixel.
 */
export function lvac7NominalSetup(scenario: Scenario): SlitSpectrographSetup {
  const ins = scenario.instrument;
  return {
    kind: 'slit', linesPerMm: ins.linesPerMm, order: ins.order, incidenceDeg: ins.incidenceDeg,
    cameraAngleDeg: diffractionAngleDeg(ins.centralWavelengthAngstrom, ins.linesPerMm, ins.order, ins.incidenceDeg),
    focalLengthMm: ins.focalLengthMm, pixelSizeUm: ins.pixelSizeUm, pixels: ins.pixels, axisPixel: (ins.pixels - 1) / 2,
  };
}

/**
 * The noise-free LVAC-7 star frame, in ADU per pixel, exactly as the generator makes it
 * before adding noise: the lines of {@link lvac7Lines} shifted by `velocityKmPerS` (the
 * observer's frame) on a Planck continuum, blurred to the nominal set-up's resolving power,
 * integrated over the pixels of `setup` (the star frame's set-up, e.g.
 * `truth.exposures[i].dispersion.star.setup`), times the instrument response and the
 * extinction at `airmass`, scaled so that the highest pixel holds peakSignalToNoise²
 * electrons.
 */
export function lvac7StarModel(scenario: Scenario, setup: SlitSpectrographSetup, velocityKmPerS: number, airmassValue: number, peakSignalToNoise: number): Float64Array {
  const ins = scenario.instrument;
  const b = scenario.binary;
  const R7 = resolvingPowerOf(lvac7NominalSetup(scenario), ins.slitFwhmPixels);
  const peakAdu = (peakSignalToNoise * peakSignalToNoise) / ins.gainElectronsPerAdu;
  return starModel(setup, lvac7Lines(b.projectedRotationKmPerS), [], b.effectiveTemperatureK, velocityKmPerS, R7, (l) => throughput(scenario, l, airmassValue), peakAdu);
}

/** LVAC-12's set-up (truth.json's `lvac12.dispersion.star.setup`): the camera on the central wavelength's axis. */
export function lvac12Setup(scenario: Scenario): SlitSpectrographSetup {
  const idIns = scenario.identificationStar.instrument;
  return {
    kind: 'slit', linesPerMm: idIns.linesPerMm, order: idIns.order, incidenceDeg: idIns.incidenceDeg,
    cameraAngleDeg: diffractionAngleDeg(idIns.centralWavelengthAngstrom, idIns.linesPerMm, idIns.order, idIns.incidenceDeg),
    focalLengthMm: idIns.focalLengthMm, pixelSizeUm: idIns.pixelSizeUm, pixels: idIns.pixels, axisPixel: (idIns.pixels - 1) / 2,
  };
}

/**
 * The noise-free LVAC-12 star frame, in ADU per pixel, exactly as the generator makes it
 * before adding noise: its lines (Balmer, Ca II, Ca I, Mg I, Na I, Fe I, Fe II) shifted by
 * `velocityKmPerS` (observer's frame) on a Planck continuum, with the telluric O2 bands,
 * at the scenario's resolving power, times the response and the extinction at `airmass`.
 */
export function lvac12StarModel(scenario: Scenario, velocityKmPerS: number, airmassValue: number): Float64Array {
  const id = scenario.identificationStar;
  const peakAdu = (id.peakSignalToNoise * id.peakSignalToNoise) / scenario.instrument.gainElectronsPerAdu;
  return starModel(lvac12Setup(scenario), lvac12Lines(), telluricLines(), id.effectiveTemperatureK, velocityKmPerS, id.resolvingPower, (l) => throughput(scenario, l, airmassValue), peakAdu);
}

// ---------------------------------------------------------------------------------------------
// The whole data set

/** Reads data/demo/scenario.json. */
export function readScenario(path = join(HERE, 'scenario.json')): Scenario {
  return JSON.parse(readFileSync(path, 'utf8')) as Scenario;
}

/** Writes bytes through a temporary file and a rename (creating the folder). */
function writeAtomic(path: string, bytes: Uint8Array | string): void {
  mkdirSync(dirname(path), { recursive: true });
  writeFileAtomic(path, bytes);
}

/** The season's nights (UTC dates of the mornings), first and last from the scenario, the rest at random. */
function seasonNights(scenario: Scenario, u: () => number): string[] {
  const season = scenario.binary.season;
  const first = mjdUtcOf(utcFromCalendar(...parseDate(season.firstNightUtc)));
  const last = mjdUtcOf(utcFromCalendar(...parseDate(season.lastNightUtc)));
  const damaged = mjdUtcOf(utcFromCalendar(...parseDate(scenario.binary.damagedNightUtc)));
  const pool: number[] = [];
  for (let d = first + 1; d < last; d++) if (d !== damaged) pool.push(d);
  const chosen = new Set<number>([first, last]);
  while (chosen.size < season.nights) chosen.add(pool[Math.floor(u() * pool.length)]);
  return [...chosen].sort((a, b) => a - b).map((d) => isoDate(utcFromMjd(d)));
}

/**
 * Generates the demo data into `dir` (data/demo/ by default) and returns the paths written
 * (relative to `dir`). Deterministic: the same scenario gives the same bytes.
 */
export function generateDemo(dir: string = HERE, scenario: Scenario = readScenario()): string[] {
  const written: string[] = [];
  const put = (rel: string, bytes: Uint8Array | string) => {
    writeAtomic(join(dir, rel), bytes);
    written.push(rel);
  };
  const u = uniformGenerator(scenario.seed);
  const seedOf = () => Math.floor(u() * 2 ** 32);
  const normal = normalGenerator(scenario.seed + 1);
  const site = makeSite(scenario.site.latitudeDeg, scenario.site.longitudeDegEast, scenario.site.heightM);
  const theSky = sky(site);
  const ins = scenario.instrument;
  const camera: Camera = { gainElectronsPerAdu: ins.gainElectronsPerAdu, readNoiseElectrons: ins.readNoiseElectrons, saturationAdu: ins.saturationAdu };

  const nominal = lvac7NominalSetup(scenario);
  const axisPixel = nominal.axisPixel!;
  const R7 = resolvingPowerOf(nominal, ins.slitFwhmPixels);
  const b = scenario.binary;
  const lamp = scenario.lamp;
  const setupLabel7 = `${ins.linesPerMm} l/mm, centre ${ins.centralWavelengthAngstrom} A`;

  const nights = seasonNights(scenario, u);
  const allNights = [...nights, b.damagedNightUtc].sort();
  const exposures: TrueExposure[] = [];
  const lampLen = lamp.exposureSeconds;
  const sequenceS = lampLen + lamp.gapBeforeStarSeconds + b.season.exposureSeconds + lamp.gapAfterStarSeconds + lampLen;
  for (const night of allNights) {
    const start = sequenceStart(theSky, night, sequenceS, b.raDeg, b.decDeg, b.season.minimumAltitudeDeg, b.season.sunBelowDeg, u);
    if (!start) throw new Error(`generator: LVAC-7 is not observable on the night ending ${night}; change the scenario's dates or limits`);
    const observer = scenario.observers[Math.floor(u() * scenario.observers.length)];
    const incidenceOffsetDeg = ins.nightlyIncidenceSigmaDeg * normal();
    const flexurePixelsPerHour = ins.flexurePixelsPerHourSigma * normal();
    const [snrLo, snrHi] = b.season.peakSignalToNoise;
    const snr = snrLo + (snrHi - snrLo) * u();
    const seeds = [seedOf(), seedOf(), seedOf()];

    const lampBeforeStart = start;
    const starStart = addSeconds(start, lampLen + lamp.gapBeforeStarSeconds);
    const lampAfterStart = addSeconds(starStart, b.season.exposureSeconds + lamp.gapAfterStarSeconds);
    const starMid = addSeconds(starStart, b.season.exposureSeconds / 2);
    const setupAt = (mid: UtcTime): SlitSpectrographSetup => {
      const hours = (mjdUtcOf(mid) - mjdUtcOf(starMid)) * 24;
      return { ...nominal, incidenceDeg: round(ins.incidenceDeg + incidenceOffsetDeg, 9), axisPixel: round(axisPixel + flexurePixelsPerHour * hours, 9) };
    };
    const setups = {
      lampBefore: setupAt(addSeconds(lampBeforeStart, lampLen / 2)),
      star: setupAt(starMid),
      lampAfter: setupAt(addSeconds(lampAfterStart, lampLen / 2)),
    };

    const bc = barycentricCorrection({ time: starMid, target: { raDeg: b.raDeg, decDeg: b.decDeg }, site });
    const vBary = radialVelocityKmPerS(b.orbit, [bc.bjdTdb])[0];
    const vTopo = topocentricVelocityKmPerS(vBary, bc.barycentricCorrectionKmPerS);
    const alt = theSky.altitudeDeg(starMid, b.raDeg, b.decDeg);
    const X = airmass(alt);

    const folder = `lvac7/${night}`;
    const files = { lampBefore: `${folder}/lamp-before.fits`, star: `${folder}/star.fits`, lampAfter: `${folder}/lamp-after.fits` };
    const lampCards = (s: UtcTime) => frameHeader(scenario, { object: 'Ne-Ar lamp', frameType: 'lamp', start: s, exposureS: lampLen, observer, instrumentNote: setupLabel7, lamp: lamp.lamp });
    for (const [key, s, seed] of [['lampBefore', lampBeforeStart, seeds[0]], ['lampAfter', lampAfterStart, seeds[2]]] as const) {
      const frame = expose(lampModel(setups[key], lamp, R7), camera, seed);
      put(files[key], frameBytes(frame.flux, frame.uncertainty, lampCards(s)));
    }
    const model = lvac7StarModel(scenario, setups.star, vTopo, X, snr);
    const frame = expose(model, camera, seeds[1]);
    const starHeader = frameHeader(scenario, {
      object: b.name, frameType: 'object', start: starStart, exposureS: b.season.exposureSeconds, observer, instrumentNote: setupLabel7,
      target: { raDeg: b.raDeg, decDeg: b.decDeg }, airmass: X,
    });
    const damaged = night === b.damagedNightUtc;
    put(files.star, frameBytes(frame.flux, frame.uncertainty, starHeader));
    exposures.push({
      night, damaged, files, observer,
      dateObs: formatUtcTime(starStart, 0).replace(/\.0*$/, ''),
      exposureSeconds: b.season.exposureSeconds,
      midpointUtc: formatUtcTime(starMid, 1),
      bjdTdb: round(bc.bjdTdb, 8),
      barycentricCorrectionKmPerS: round(bc.barycentricCorrectionKmPerS, 6),
      barycentricVelocityKmPerS: round(vBary, 6),
      topocentricVelocityKmPerS: round(vTopo, 6),
      airmass: round(X, 4),
      peakSignalToNoise: round(snr, 2),
      incidenceOffsetDeg: round(incidenceOffsetDeg, 6),
      flexurePixelsPerHour: round(flexurePixelsPerHour, 4),
      dispersion: { lampBefore: trueDispersion(setups.lampBefore), star: trueDispersion(setups.star), lampAfter: trueDispersion(setups.lampAfter) },
    });
  }

  // The damaged file: the damaged night's star frame cut short, as an interrupted copy leaves it.
  const damagedExposure = exposures.find((e) => e.damaged)!;
  const damagedPath = join(dir, damagedExposure.files.star);
  const full = readFileSync(damagedPath);
  const kept = 2880 + 4000; // the header block and part of the data: not a whole number of FITS blocks
  writeAtomic(damagedPath, full.subarray(0, kept));

  // LVAC-12: one low-resolution exposure with a mercury-neon-argon lamp before it.
  const id = scenario.identificationStar;
  const idIns = id.instrument;
  const idSetup = lvac12Setup(scenario);
  const idLamp = id.lamp;
  const idSequence = idLamp.exposureSeconds + idLamp.gapBeforeStarSeconds + id.exposureSeconds;
  const idStart = sequenceStart(theSky, id.nightUtc, idSequence, id.raDeg, id.decDeg, b.season.minimumAltitudeDeg, b.season.sunBelowDeg, u);
  if (!idStart) throw new Error(`generator: LVAC-12 is not observable on the night ending ${id.nightUtc}`);
  const idObserver = scenario.observers[Math.floor(u() * scenario.observers.length)];
  const idStarStart = addSeconds(idStart, idLamp.exposureSeconds + idLamp.gapBeforeStarSeconds);
  const idMid = addSeconds(idStarStart, id.exposureSeconds / 2);
  const idBc = barycentricCorrection({ time: idMid, target: { raDeg: id.raDeg, decDeg: id.decDeg }, site });
  const idTopo = topocentricVelocityKmPerS(id.radialVelocityKmPerS, idBc.barycentricCorrectionKmPerS);
  const idX = airmass(theSky.altitudeDeg(idMid, id.raDeg, id.decDeg));
  const setupLabel12 = `${idIns.linesPerMm} l/mm, centre ${idIns.centralWavelengthAngstrom} A`;
  const idFiles = { lamp: `lvac12/${id.nightUtc}/lamp.fits`, star: `lvac12/${id.nightUtc}/star.fits` };
  {
    const frame = expose(lampModel(idSetup, idLamp, id.resolvingPower), camera, seedOf());
    put(idFiles.lamp, frameBytes(frame.flux, frame.uncertainty, frameHeader(scenario, {
      object: 'Hg-Ne-Ar lamp', frameType: 'lamp', start: idStart, exposureS: idLamp.exposureSeconds, observer: idObserver, instrumentNote: setupLabel12, lamp: idLamp.lamp,
    })));
  }
  const lines12 = lvac12Lines();
  {
    const frame = expose(lvac12StarModel(scenario, idTopo, idX), camera, seedOf());
    put(idFiles.star, frameBytes(frame.flux, frame.uncertainty, frameHeader(scenario, {
      object: id.name, frameType: 'object', start: idStarStart, exposureS: id.exposureSeconds, observer: idObserver, instrumentNote: setupLabel12,
      target: { raDeg: id.raDeg, decDeg: id.decDeg }, airmass: idX,
    })));
  }
  const composition = new Map<string, number>();
  for (const l of lines12) composition.set(l.species!, (composition.get(l.species!) ?? 0) + 1);

  const truth: DemoTruth = {
    note: 'INVENTED: the true values the demo data were generated from (data/demo/generate.ts). Velocities in km/s, positive receding; times BJD_TDB (days) and UTC; wavelengths in Å, air.',
    generator: 'data/demo/generate.ts',
    scenario: 'data/demo/scenario.json',
    orbit: b.orbit,
    site,
    exposures,
    lvac12: {
      files: idFiles,
      dateObs: formatUtcTime(idStarStart, 0).replace(/\.0*$/, ''),
      midpointUtc: formatUtcTime(idMid, 1),
      bjdTdb: round(idBc.bjdTdb, 8),
      barycentricCorrectionKmPerS: round(idBc.barycentricCorrectionKmPerS, 6),
      barycentricVelocityKmPerS: id.radialVelocityKmPerS,
      topocentricVelocityKmPerS: round(idTopo, 6),
      airmass: round(idX, 4),
      resolvingPower: id.resolvingPower,
      composition: [...composition].map(([species, lines]) => ({ species, lines })),
      telluric: ['O2'],
      dispersion: { lamp: trueDispersion(idSetup), star: trueDispersion(idSetup) },
    },
    damagedFile: {
      file: damagedExposure.files.star, bytesKept: kept, bytesOriginal: full.length,
      why: 'deliberately truncated (as an interrupted copy would leave it) so that the batch shows it carries on past a bad file and reports it',
    },
  };
  put('truth.json', JSON.stringify(truth, null, 2) + '\n');
  return written;
}

if (process.argv[1] && pathToFileURL(resolve(process.argv[1])).href === import.meta.url) {
  const dir = resolve(process.argv[2] ?? HERE);
  const t0 = Date.now();
  const files = generateDemo(dir);
  console.log(`wrote ${files.length} files under ${relative(process.cwd(), dir) || '.'} in ${((Date.now() - t0) / 1000).toFixed(1)} s`);
}
