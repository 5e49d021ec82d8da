/**
 * The demo's shareable report: one self-contained HTML page (inline SVG plots, tables, the
 * provenance of every number, the safety cautions, the invented-data banner) built from the
 * outputs of the command-line steps in a {@link DemoRun}. The plots are drawn by the
 * library's plot builders from those outputs; nothing is recomputed here except the
 * comparison with the truth.
 */
import { join } from 'node:path';
import { readSolution } from '../../src/calibrate/solution-json.js';
import type { LineFitResult } from '../../src/fit/line-fit.js';
import { readSpectrum } from '../../src/io/read.js';
import { radialVelocityKmPerS, type KeplerianOrbit } from '../../src/orbit/keplerian.js';
import { baluevFalseAlarmProbability } from '../../src/orbit/periodogram.js';
import { readVelocityTable } from '../../src/orbit/table.js';
import { crossCorrelationPlot } from '../../src/plot/crossCorrelation.js';
import { periodogramPlot, type FalseAlarmLevel } from '../../src/plot/periodogram.js';
import { plotCalibration } from '../../src/plot/results/calibration.js';
import { plotLineFit } from '../../src/plot/results/line-fit.js';
import type { VegaLiteSpec } from '../../src/plot/spec.js';
import { spectrumPlot, spectrumPlotData, type MarkedLine } from '../../src/plot/spectrum.js';
import { phaseFoldedVelocityPlot, velocityCurvePlot } from '../../src/plot/velocity.js';
import { plotBlock, type ReportBlock, type ReportDocument, type ReportSection } from '../../src/report/document.js';
import { formatMeasured, formatNumber, formatProbability } from '../../src/report/format.js';
import type { Table } from '../../src/report/table.js';
import type { Header } from '../../src/spectrum/header.js';
import { provenanceEntry, type ProvenanceEntry } from '../../src/spectrum/provenance.js';
import { VERSION } from '../../src/version.js';
import { sha256 } from './cli.js';
import type { OrbitJson } from './compare.js';
import { DATA, REPO } from './paths.js';
import type { DemoRun } from './pipeline.js';

/** Options of {@link demoReport}. */
export interface DemoReportOptions {
  /** Header whose cards are shown for the night in detail (default: that star's calibrated FITS header). Tests pass one with markup in it. */
  readonly header?: Header;
}

const m = (x: { value: number; uncertainty: number }, unit?: string) => formatMeasured(x.value, x.uncertainty, unit);
/** +1.5, −0.4 (one decimal, always signed). */
const signed = (x: number) => `${x < 0 ? '−' : '+'}${Math.abs(x).toFixed(1)}`;
/** Hα … Hε for a Balmer line's air wavelength (Å), else the wavelength. */
const balmerName = (w: number) => ({ 6563: 'Hα', 4861: 'Hβ', 4340: 'Hγ', 4102: 'Hδ', 3970: 'Hε' } as Record<number, string>)[Math.round(w)] ?? `${w.toFixed(0)} Å`;
const KEPLER = (o: OrbitJson): KeplerianOrbit => ({
  periodDays: o.period.value, periastronTimeBjdTdb: o.periastronTime.value, eccentricity: o.eccentricity.value,
  omegaDeg: o.omega.value, semiAmplitudeKmPerS: o.semiAmplitude.value, systemicVelocityKmPerS: o.systemicVelocity.value,
});

/**
 * The power at which the Baluev (2008) false-alarm probability of the periodogram equals `p`
 * (bisection on the standard power; the same formula the periodogram command reports).
 */
function falseAlarmPower(p: number, bjd: ArrayLike<number>, sigma: ArrayLike<number>, maxFrequencyPerDay: number): number {
  const fap = (z: number) => baluevFalseAlarmProbability(z, bjd, sigma, maxFrequencyPerDay).baluev;
  if (!(fap(1 - 1e-15) <= p)) return NaN;
  let lo = 0, hi = 1;
  while (hi - lo > 1e-12) {
    const mid = (lo + hi) / 2;
    if (fap(mid) > p) lo = mid; else hi = mid;
  }
  return (lo + hi) / 2;
}

/** The step a number came from, for captions: `step 2, lineshift batch`. */
function from(run: DemoRun, name: string): string {
  const i = run.steps.findIndex((s) => s.name === name);
  return i < 0 ? '' : `step ${i + 1}, lineshift ${run.steps[i].args[0]}`;
}

/** Header cards a reader cares about, shown as given (escaped by the report). */
function headerFacts(header: Header): [string, string][] {
  const keys = ['OBJECT', 'IMAGETYP', 'DATE-OBS', 'EXPTIME', 'RA', 'DEC', 'AIRMASS', 'OBSERVER', 'TELESCOP', 'INSTRUME', 'SETUP', 'SITELAT', 'SITELONG', 'SITEELEV'];
  const out: [string, string][] = [];
  for (const k of keys) {
    const v = header.get(k);
    if (v !== undefined && v !== null) out.push([k, String(v)]);
  }
  const comments = header.commentary('COMMENT');
  if (comments.length) out.push(['COMMENT', comments.join(' ')]);
  return out;
}

/** Everything the report shows, as a {@link ReportDocument} (call `reportHtml` on it). */
export async function demoReport(run: DemoRun, options: DemoReportOptions = {}): Promise<ReportDocument> {
  const { scenario: sc, truth, comparison: cmp, batch } = run;
  const b = sc.binary;
  const night = run.night;
  const nightResult = batch.results.find((r) => r.label === `${night}/star.fits`)!;
  const starSpectrum = readSpectrum(join(REPO, nightResult.calibratedFile));
  const header = options.header ?? starSpectrum.header;
  const table = readVelocityTable(join(REPO, run.outDir, 'lvac7', 'velocities.csv'));
  const orbit = KEPLER(run.orbit);
  const orbitAt = (t: number) => radialVelocityKmPerS(orbit, [t])[0];
  const plots: Record<string, ReportBlock> = {};
  const plot = async (key: string, spec: VegaLiteSpec, caption: string) => { plots[key] = await plotBlock(spec, caption); };

  // Calibration residuals of one lamp.
  const solution = readSolution(join(REPO, run.calibrationSolutionFile));
  await plot('calibration', plotCalibration(solution, { title: `Wavelength calibration: neon-argon lamp before LVAC-7, ${night}` }),
    `Dispersion solution of the lamp taken before the star on ${night} (${from(run, 'calibrate-lamp')}): above, wavelength against pixel with the identified lines; below, each line's residual (list wavelength − solution) in Å; crosses were not used (saturated or clipped).`);

  // A line fit (the command's JSON has no curve: the fitted pixels are the spectrum's inside the window).
  const fit = run.lineFit;
  const w = starSpectrum.wavelength;
  const inWindow: number[] = [];
  for (let i = 0; i < w.length; i++) if (w[i] >= fit.window.start && w[i] <= fit.window.end && Number.isFinite(starSpectrum.flux[i])) inWindow.push(i);
  const fitResult = { ...fit, curve: { x: inWindow.map((i) => w[i]), flux: inWindow.map((i) => starSpectrum.flux[i]), model: [], continuum: [] } } as unknown as LineFitResult;
  await plot('line-fit', plotLineFit(fitResult, { spectrum: starSpectrum, labels: [`${run.lineFitLine.species} ${run.lineFitLine.restAngstrom.toFixed(2)}`] }),
    `Gaussian fit of the ${run.lineFitLine.species} ${run.lineFitLine.restAngstrom.toFixed(2)} Å line in the calibrated spectrum of ${night} (${from(run, 'fit-line')}); residuals in units of each pixel's σ.`);

  // Cross-correlation.
  const c = run.ccf.ccf!;
  const pm = c.peakModel;
  await plot('ccf', crossCorrelationPlot({
    velocityKmPerS: c.curve.velocityKmPerS, correlation: c.curve.correlation,
    peak: {
      velocityKmPerS: run.ccf.measuredVelocity.value, uncertaintyKmPerS: run.ccf.measuredVelocity.uncertainty, fitRangeKmPerS: c.peakFitRangeKmPerS,
      model: pm ? (x: number) => pm.baseline + pm.amplitude * Math.exp(-0.5 * ((x - pm.centerKmPerS) / pm.sigmaKmPerS) ** 2) : undefined,
    },
  }, {
    title: `LVAC-7: cross-correlation, ${night}`,
    subtitle: `v = ${m(run.ccf.measuredVelocity, 'km/s')} in the observer's frame; peak height ${c.peakHeight.toFixed(3)}, FWHM ${c.peakFwhmKmPerS.toFixed(0)} km/s; with ${c.template}`,
    velocityTitle: "Line-of-sight velocity, observer's frame (km/s)",
  }), `Cross-correlation of the calibrated spectrum of ${night} with a template of H I, Si II and Fe II lines (${from(run, 'cross-correlate')}); the dashed curve is the Gaussian fitted to the peak, the band ±1σ of the velocity.`);

  // LVAC-12 with its identified lines.
  const l12 = readSpectrum(join(REPO, run.lvac12.apply.out));
  const marked: MarkedLine[] = [];
  const verdictRank: Record<string, number> = { present: 2, possible: 1 };
  for (const line of run.lvac12.elements.lines) {
    const best = line.identifications[0];
    if (!best || line.centreTooUncertain) continue;
    if (best.telluric) { marked.push({ wavelengthAngstrom: line.wavelengthAngstrom, label: `${best.band ?? 'O2'} (telluric)`, priority: 1 }); continue; }
    const rank = verdictRank[best.verdict] ?? 0;
    if (rank === 0) continue;
    marked.push({ wavelengthAngstrom: line.wavelengthAngstrom, label: `${best.species} ${best.restWavelengthAngstrom.toFixed(0)}`, priority: rank * 10 + Math.min(9, line.significance / 10) });
  }
  const present = run.lvac12.elements.elements.filter((e) => e.verdict === 'present').map((e) => e.species);
  await plot('lvac12', spectrumPlot(spectrumPlotData(l12, { lines: marked }), {
    title: 'LVAC-12: calibrated spectrum with the identified lines',
    subtitle: `R ≈ ${run.lvac12.elements.resolvingPower.toFixed(0)}; present: ${present.join(', ') || 'none'}; labels: species and rest wavelength (Å) of the best identification of each found line (present or possible species, and telluric bands)`,
    labelOverflow: 'drop', maxLabelRows: 6, height: 300,
  }), `The low-resolution spectrum of LVAC-12 (${from(run, 'apply-lvac12')}) with the lines found and identified (${from(run, 'elements-lvac12')}); flux in ADU, not corrected for the instrument's response.`);

  // Velocity curve, periodogram, phase-folded curve.
  const elementsLine = `P = ${m(run.orbit.period, 'd')}, e = ${m(run.orbit.eccentricity)}, K = ${m(run.orbit.semiAmplitude, 'km/s')}, γ = ${m(run.orbit.systemicVelocity, 'km/s')}`;
  await plot('velocity-curve', velocityCurvePlot({
    bjdTdb: table.bjdTdb, velocityKmPerS: table.velocityKmPerS, uncertaintyKmPerS: table.uncertaintyKmPerS,
    orbitVelocityKmPerS: orbitAt, systemicVelocityKmPerS: orbit.systemicVelocityKmPerS, periodDays: orbit.periodDays,
  }, { title: 'LVAC-7: radial velocity over the 2025 season and the fitted orbit', subtitle: `${table.bjdTdb.length} nights; ${elementsLine}; residual RMS ${run.orbit.rms.toFixed(2)} km/s` }),
  `Barycentric radial velocities of LVAC-7 (${from(run, 'batch')}) with the orbit fitted to them (${from(run, 'orbit')}); residuals observed − orbit below.`);
  const fMax = 1 / run.periodogram.minPeriod;
  const levels: FalseAlarmLevel[] = [0.1, 0.01, 0.001]
    .map((p) => ({ probability: p, power: falseAlarmPower(p, table.bjdTdb, table.uncertaintyKmPerS, fMax) }))
    .filter((l) => Number.isFinite(l.power));
  await plot('periodogram', periodogramPlot({
    frequencyPerDay: run.periodogram.frequency, power: run.periodogram.power, bestFrequencyPerDay: run.periodogram.bestFrequency, falseAlarmLevels: levels,
  }, {
    title: 'LVAC-7: periodogram of the season\'s velocities',
    subtitle: `highest peak at ${run.periodogram.bestPeriod.toFixed(3)} d, false-alarm probability ${formatProbability(run.periodogram.falseAlarmProbability)} (Baluev 2008); dashed: the power of false-alarm probability 10 %, 1 %, 0.1 %`,
    powerTitle: 'Power (fraction of variance explained)', peakName: 'Highest peak',
  }), `Generalised Lomb-Scargle periodogram (${from(run, 'periodogram')}). The peaks near 1 day are aliases made by observing once a night.`);
  await plot('phase', phaseFoldedVelocityPlot({
    bjdTdb: table.bjdTdb, velocityKmPerS: table.velocityKmPerS, uncertaintyKmPerS: table.uncertaintyKmPerS, orbitVelocityKmPerS: orbitAt,
    systemicVelocityKmPerS: orbit.systemicVelocityKmPerS, periodDays: orbit.periodDays, epochBjdTdb: orbit.periastronTimeBjdTdb,
  }, { title: 'LVAC-7: velocities folded on the fitted period', subtitle: `phase 0 at periastron, BJD_TDB ${formatNumber(orbit.periastronTimeBjdTdb, 3)}; ${elementsLine}` }),
  `The same velocities folded on the fitted period (${from(run, 'orbit')}), with the orbit and the residuals.`);

  // Tables.
  const nightsTable: Table = {
    caption: `Velocities of LVAC-7, one per night (${from(run, 'batch')}); the true values are the invented ones the data were made from`,
    columns: [
      { key: 'night', label: 'Night (UTC date)' }, { key: 'bjd', label: 'BJD_TDB', digits: 5 }, { key: 'bc', label: 'Barycentric correction', unit: 'km/s', digits: 3 },
      { key: 'rms', label: 'Lamp RMS before/after', unit: 'km/s' }, { key: 'v', label: 'Radial velocity', unit: 'km/s' }, { key: 'truth', label: 'True', unit: 'km/s', digits: 2 },
      { key: 'pull', label: '(measured − true)/σ', digits: 2 },
    ],
    rows: cmp.nights.map((n) => {
      const r = batch.results.find((x) => x.label === n.label)!;
      return {
        night: n.night, bjd: n.bjdTdb, bc: r.barycentricCorrectionKmPerS, rms: r.lamps.map((l) => (l.rmsKmPerS ?? NaN).toFixed(2)).join(' / '),
        v: { value: n.measured.value, uncertainty: n.measured.uncertainty }, truth: n.trueKmPerS, pull: n.pull,
      };
    }),
  };
  const orbitTable: Table = {
    caption: `Orbital elements (${from(run, 'orbit')}) against the invented truth`,
    columns: [{ key: 'name', label: 'Element' }, { key: 'fitted', label: 'Fitted' }, { key: 'truth', label: 'True' }, { key: 'pull', label: '(fitted − true)/σ', digits: 2 }],
    rows: cmp.orbit.map((e) => ({ name: e.name + (e.unit ? ` (${e.unit})` : ''), fitted: m(e.fitted), truth: sameDecimals(e.trueValue, m(e.fitted)), pull: e.pull })),
  };
  const speciesTable: Table = {
    caption: `Species of LVAC-12 (${from(run, 'elements-lvac12')}): the verdict of the identification and whether the invented star has them`,
    columns: [
      { key: 'species', label: 'Species' }, { key: 'verdict', label: 'Verdict' }, { key: 'lines', label: 'Expected lines matched' },
      { key: 'fap', label: 'False-alarm probability (adjusted)' }, { key: 'truth', label: 'In the star (lines put in)' },
    ],
    rows: run.lvac12.elements.elements.filter((e) => e.verdict !== 'not detected').map((e) => {
      const t = cmp.lvac12.species.find((s) => s.species === e.species);
      return {
        species: e.species, verdict: e.verdict, lines: `${e.linesMatched}/${e.linesExpected}`, fap: formatProbability(e.adjustedFalseAlarmProbability),
        truth: t?.inComposition ? `yes (${t.linesPutIn})` : 'no',
      };
    }),
  };
  const stepsTable: Table = {
    caption: 'The commands this report was made with, in order (run from the repository folder; each printed JSON, saved under steps/)',
    columns: [{ key: 'n', label: 'Step' }, { key: 'purpose', label: 'What for' }, { key: 'command', label: 'Command' }, { key: 'exit', label: 'Exit code' }, { key: 's', label: 'Time', unit: 's', digits: 1 }],
    rows: run.steps.map((s, i) => ({ n: i + 1, purpose: s.purpose, command: `lineshift ${s.args.join(' ')}`, exit: s.exitCode, s: s.seconds })),
  };

  const p = cmp.pulls;
  const zeroPoint = cmp.nights.map((n) => n.wavelengthErrorMiddleKmPerS);
  const b12 = cmp.lvac12.budget;
  const cal = cmp.calibration;
  const failure = batch.failures[0];
  const nightsUsed = batch.results.length;
  const sections: ReportSection[] = [
    {
      heading: 'What this is',
      blocks: [
        { kind: 'paragraph', text: `The ${sc.club} followed the spectroscopic binary ${b.name} (an A-type star, ${b.effectiveTemperatureK} K) over the 2025 season with a slit spectrograph, taking a neon-argon lamp before and after every star exposure, and took one low-resolution spectrum of ${sc.identificationStar.name} to see which elements it shows. This report goes from the raw 1-D spectra to the star's orbit, one command at a time. Everything here is INVENTED: the club, the site, the observers, the stars and their orbit are fictional, and the spectra were computed by data/demo/generate.ts — which is why the last section can compare every result with the truth.` },
        { kind: 'facts', items: [
          ['Site', `${sc.site.name}: latitude ${Math.abs(sc.site.latitudeDeg)}° ${sc.site.latitudeDeg >= 0 ? 'N' : 'S'}, longitude ${Math.abs(sc.site.longitudeDegEast)}° ${sc.site.longitudeDegEast >= 0 ? 'E' : 'W'}, ${sc.site.heightM} m`],
          ['Spectrograph', `${sc.instrument.linesPerMm} lines/mm grating, order ${sc.instrument.order}, ${sc.instrument.focalLengthMm} mm camera, ${sc.instrument.pixels} pixels of ${sc.instrument.pixelSizeUm} µm, centred at ${sc.instrument.centralWavelengthAngstrom} Å`],
          ['Season', `${b.season.nights} nights from ${truth.exposures[0].night} to ${truth.exposures.at(-1)!.night} (and one more whose star file was damaged), ${b.season.exposureSeconds} s per star exposure, lamps ${sc.lamp.exposureSeconds} s before and after`],
          ['Result in one line', `P = ${m(run.orbit.period, 'd')}, e = ${m(run.orbit.eccentricity)}, K = ${m(run.orbit.semiAmplitude, 'km/s')}, γ = ${m(run.orbit.systemicVelocity, 'km/s')}, from ${nightsUsed} nights`],
        ] },
        { kind: 'heading', text: `The star's header on ${night}, as recorded` },
        { kind: 'facts', items: headerFacts(header) },
      ],
    },
    {
      heading: 'Wavelength calibration',
      blocks: [
        { kind: 'paragraph', text: `Each lamp spectrum is calibrated on its own: the lamp's lines are found and centred, identified against the Ne I and Ar I line lists (air wavelengths, NIST) with the grating equation of the set-up as a hint, and a Chebyshev polynomial of order ${run.calibration.order} is fitted with clipping. The two brightest neon lines are saturated and kept out of the fit. For each star the solutions of the lamps before and after it are interpolated in time to the star's mid-exposure: the spectrograph flexes by a few hundredths of a pixel in between.` },
        plots.calibration,
        { kind: 'facts', items: [
          ['Lamp', run.calibration.file],
          ['Lines', `${run.calibration.linesMeasured} measured, ${run.calibration.linesIdentified} identified, ${run.calibration.linesUsed} used`],
          ['RMS of the residuals', `${run.calibration.rmsAngstrom!.toFixed(4)} Å = ${run.calibration.rmsPixels!.toFixed(3)} pixel = ${run.calibration.rmsKmPerS!.toFixed(2)} km/s`],
          ['Resolving power λ/FWHM', run.calibration.resolvingPower !== null ? `${run.calibration.resolvingPower.toFixed(0)} ± ${(run.calibration.resolvingPowerSpread ?? NaN).toFixed(0)}` : '—'],
          ['Against the true dispersion', `largest error ${cal.maxErrorAngstrom.toFixed(4)} Å (RMS ${cal.rmsErrorAngstrom.toFixed(4)} Å) over the 2048 pixels; the solution's own 1-σ error reaches ${cal.statedMaxAngstrom.toFixed(4)} Å`],
        ] },
      ],
    },
    {
      heading: 'Lines and velocities',
      blocks: [
        { kind: 'paragraph', text: `The batch command reduced every night: ${nightsUsed} star exposures with their lamps, spread over ${batch.workers} worker thread${batch.workers === 1 ? '' : 's'}. Each velocity comes from the Balmer line Hα, Si II 6347/6371 and the Fe II lines (each fitted, then combined with outlier rejection), includes the calibration's error, and is corrected to the solar-system barycentre for the header's time, target and site (BJD_TDB at mid-exposure).` },
        plots['line-fit'],
        plots.ccf,
        { kind: 'paragraph', text: `On ${night}: lines ${m(nightResult.measuredVelocity, 'km/s')}, cross-correlation ${m(run.ccf.measuredVelocity, 'km/s')} (observer's frame); true ${formatNumber(truth.exposures.find((e) => e.night === night)!.topocentricVelocityKmPerS, 3)} km/s.` },
        { kind: 'table', table: nightsTable },
        { kind: 'paragraph', text: `One file could not be used, and the batch carried on: ${failure.message}. It is the deliberately truncated file of the demo data (see data/demo/README.md); its night is missing from the table.` },
      ],
    },
    {
      heading: 'Period and orbit',
      blocks: [
        plots.periodogram,
        { kind: 'facts', items: [
          ['Highest peak', `${run.periodogram.bestPeriod.toFixed(3)} d, power ${run.periodogram.bestPower.toFixed(3)}, false-alarm probability ${formatProbability(run.periodogram.falseAlarmProbability)}`],
          ['Aliases of it', run.periodogram.aliases.slice(0, 2).map((a) => `${a.period.toFixed(4)} d`).join(', ') + ' (one observation a night)'],
        ] },
        plots['velocity-curve'],
        plots.phase,
        { kind: 'facts', items: [
          ['Period P', m(run.orbit.period, 'd')],
          ['Periastron time T', m(run.orbit.periastronTime, 'BJD_TDB')],
          ['Eccentricity e', `${m(run.orbit.eccentricity)} (a circular orbit is ruled out: Lucy & Sweeney probability ${formatProbability(run.orbit.lucySweeney.probability)})`],
          ['Argument of periastron ω', m(run.orbit.omega, '°')],
          ['Semi-amplitude K', m(run.orbit.semiAmplitude, 'km/s')],
          ['Systemic velocity γ', m(run.orbit.systemicVelocity, 'km/s')],
          ['Mass function f(m)', m(run.orbit.massFunction, 'M☉ (nominal)')],
          ['Fit quality', `χ² = ${run.orbit.chiSquare.toFixed(1)} for ${run.orbit.degreesOfFreedom} degrees of freedom; residual RMS ${run.orbit.rms.toFixed(2)} km/s`],
        ] },
      ],
    },
    {
      heading: `${sc.identificationStar.name}: which elements?`,
      blocks: [
        { kind: 'paragraph', text: `One spectrum across the visible at R ≈ ${sc.identificationStar.resolvingPower} with a 200 lines/mm grating, calibrated on a mercury-neon-argon lamp taken just before it (RMS ${run.lvac12.calibration.rmsAngstrom!.toFixed(3)} Å from ${run.lvac12.calibration.linesUsed} lines). Its velocity from the Balmer lines, ${m(run.lvac12.velocity.measuredVelocity, 'km/s')} in the observer's frame, places the line lists; every found line is then compared with every shipped list and the evidence weighed per species. At this resolution most metal lines blend, so a species is called present only on strong evidence; "possible" is not a claim.` },
        plots.lvac12,
        { kind: 'table', table: speciesTable },
        ...telluricNote(run),
      ],
    },
    {
      heading: 'How close to the truth?',
      blocks: [
        { kind: 'paragraph', text: 'This section compares the results with the invented values the data were generated from (data/demo/truth.json). It checks the whole chain — calibration, interpolation, line fits, barycentric correction, period search and orbit fit — against our own truth, not against the real world.' },
        { kind: 'table', table: orbitTable },
        { kind: 'paragraph', text: 'Pulls are (fitted − true)/σ. The nightly velocities share no error beyond the calibration, so over 24 nights the mean pull scatters by 1/√24 ≈ 0.2 from season to season, and γ follows it. A season that comes out 2 σ low, as this seed does, is a chance of about 1 in 20: bench/demo-velocity-budget.ts splits each night\'s error into calibration, noise and method, and regenerates the season with other seeds to show that the mean pull then centres on zero.' },
        { kind: 'facts', items: [
          ['Velocities per night', `χ² = ${p.chiSquare.toFixed(1)} for ${p.count} nights (probability of a larger value ${formatProbability(p.chiSquareProbability)}); mean pull ${formatNumber(p.meanPull, 2)}, RMS pull ${p.rmsPull.toFixed(2)}, largest |pull| ${p.maxAbsPull.toFixed(2)}`],
          ['BJD_TDB', `largest difference ${Math.max(...cmp.nights.map((n) => Math.abs(n.bjdDifferenceSeconds))).toFixed(4)} s (the same header keys and library as the generator)`],
          ['Calibrated wavelengths of the stars', `at the middle of the spectra (the velocity zero point) the error is ${formatNumber(mean(zeroPoint), 3)} km/s on average, RMS of error/stated ${Math.sqrt(mean(cmp.nights.map((n) => (n.wavelengthErrorMiddleKmPerS / n.statedCalibrationKmPerS) ** 2))).toFixed(2)} (median stated error ${median(cmp.nights.map((n) => n.statedCalibrationKmPerS)).toFixed(3)} km/s); largest error over all pixels and nights ${Math.max(...cmp.nights.map((n) => n.wavelengthErrorMaxKmPerS)).toFixed(2)} km/s`],
          [`${sc.identificationStar.name} velocity`, `${m(cmp.lvac12.measured, 'km/s')} barycentric against ${cmp.lvac12.trueKmPerS} km/s true (${formatNumber(cmp.lvac12.pull, 1)} σ). Of the ${signed(b12.totalKmPerS)} km/s: calibration ${signed(b12.calibrationKmPerS)} km/s at the Balmer lines; metal lines inside the Balmer profiles at R ≈ 900 ${signed(b12.blendKmPerS)} km/s (measured on the noise-free frame: ${b12.lines.map((l) => `${balmerName(l.restAngstrom)} ${signed(l.noiseFreeKmPerS)}`).join(', ')} km/s), a bias the per-line errors do not include; noise ${signed(b12.remainderKmPerS)} km/s (statistical σ ${b12.statisticalKmPerS.toFixed(1)} km/s)`],
          [`${sc.identificationStar.name} species`, `put in: ${truth.lvac12.composition.map((c) => c.species).join(', ')}; called present: ${present.join(', ') || 'none'}; present or possible and really there: ${cmp.lvac12.found.join(', ')}; put in but not found: ${truth.lvac12.composition.map((c) => c.species).filter((s) => !cmp.lvac12.found.includes(s)).join(', ') || 'none'}; called present but absent: ${cmp.lvac12.falsePresent.join(', ') || 'none'}`],
        ] },
      ],
    },
    {
      heading: 'The commands',
      blocks: [
        { kind: 'paragraph', text: 'Every number above comes from one of these commands of the lineshift tool; the plots are drawn from their outputs. Run npm run demo to make this report again: the data are seeded, so the numbers are the same.' },
        { kind: 'table', table: stepsTable },
      ],
    },
  ];

  const lvac7Files = truth.exposures.flatMap((e) => [e.files.lampBefore, e.files.star, e.files.lampAfter]);
  const provenance: ProvenanceEntry[] = [
    provenanceEntry('generate-demo-data', { generator: 'data/demo/generate.ts', scenario: 'data/demo/scenario.json', seed: sc.seed }),
    ...run.steps.map((s, i) => provenanceEntry(`step ${i + 1}: lineshift ${s.args[0]}`, { args: s.args.slice(1), exitCode: s.exitCode, output: s.output })),
  ];
  return {
    title: `${b.name}: the 2025 season (invented data)`,
    subtitle: `${sc.club} — wavelength calibration, radial velocities, period and orbit of ${b.name}, and the elements of ${sc.identificationStar.name}`,
    inventedData: true,
    sections,
    provenance,
    provenanceFacts: [
      ['Library', `lineshift ${VERSION}`],
      ['Node.js', process.version],
      ['Demo data', `${DATA}/ (INVENTED; made by data/demo/generate.ts from scenario.json, seed ${sc.seed})`],
      ['Scenario (sha256)', sha256(join(REPO, DATA, 'scenario.json'))],
      ['Truth (sha256)', sha256(join(REPO, DATA, 'truth.json'))],
      ['LVAC-7 input files', `${lvac7Files.length} FITS files under ${DATA}/lvac7/ (one night per folder: lamp-before, star, lamp-after)`],
      ['LVAC-12 input files', `${DATA}/${truth.lvac12.files.lamp}, ${DATA}/${truth.lvac12.files.star}`],
      ['Outputs', `${run.outDir}/: results.json, truth-comparison.csv, lvac7/ (velocities.csv, velocities.json, batch.json, spectra/, solutions/), lvac12/, steps/`],
    ],
  };
}

/** A sentence on lines the identification gave to a telluric band although a species of the star sits there (Na I D in the weak water band). */
function telluricNote(run: DemoRun): ReportBlock[] {
  const inStar = new Set(run.truth.lvac12.composition.map((c) => c.species));
  const notes: string[] = [];
  for (const line of run.lvac12.elements.lines) {
    const best = line.identifications[0];
    if (!best?.telluric) continue;
    const stellar = line.identifications.find((c) => !c.telluric && inStar.has(c.species));
    if (stellar) notes.push(`the line at ${line.wavelengthAngstrom.toFixed(1)} Å (${stellar.species} ${stellar.restWavelengthAngstrom.toFixed(1)} Å in the star) lies in the telluric ${best.band ?? 'band'} and was given to the atmosphere`);
  }
  return notes.length ? [{ kind: 'paragraph', text: `Telluric bands: ${notes.join('; ')}. Such a line cannot count as evidence for the star.` }] : [];
}

/** A true value written with as many decimals as the fitted value beside it. */
function sameDecimals(value: number, fitted: string): string {
  const decimals = /\.(\d+)/.exec(fitted.split('±')[0])?.[1].length ?? 0;
  return formatNumber(value, Math.max(decimals, 1));
}

function mean(values: readonly number[]): number {
  return values.reduce((a, b) => a + b, 0) / values.length;
}

function median(values: readonly number[]): number {
  const s = [...values].sort((a, b) => a - b);
  const k = s.length >> 1;
  return s.length % 2 ? s[k] : (s[k - 1] + s[k]) / 2;
}
