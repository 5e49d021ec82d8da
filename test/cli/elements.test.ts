/**
 * `lineshift elements` on invented text spectra written to a temporary folder, through runCli
 * with a capturing CommandIO.
 */
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import type { ElementsReport } from '../../src/cli/commands/elements.js';
import { runCli } from '../../src/cli/run.js';
import { collectingLogger } from '../../src/logger.js';
import type { Spectrum } from '../../src/spectrum/spectrum.js';
import { SCENARIOS } from '../elements/simulate.js';
import { syntheticSpectrum } from '../elements/synthetic-spectrum.js';
import { repoPath } from '../helpers/paths.js';
import { captureIO } from '../helpers/cli.js';

const capture = () => captureIO();

const dir = mkdtempSync(join(tmpdir(), 'lineshift-elements-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

function writeText(name: string, s: Spectrum, medium = '# medium: air'): string {
  const rows = ['# invented data (Larkspur Valley Astronomy Club demo): not an observation', medium, 'wavelength [Angstrom],flux,error'];
  s.wavelength.forEach((w, i) => rows.push(`${w.toFixed(4)},${s.flux[i].toFixed(6)},${s.uncertainty![i].toPrecision(6)}`));
  const path = join(dir, name);
  writeFileSync(path, rows.join('\n') + '\n');
  return path;
}

const neonScenario = { ...SCENARIOS.find((s) => s.name === 'neon lamp')!, startAngstrom: 5800, endAngstrom: 6700 };
const lamp = syntheticSpectrum(neonScenario, 4000, 100, 21);
const lampFile = writeText('lvac-neon.csv', lamp.spectrum);

describe('lineshift elements', () => {
  it('prints elements and lines as JSON, most certain first', async () => {
    const io = capture();
    const v = lamp.velocityKmPerS.toFixed(3);
    expect(await runCli(['elements', lampFile, '--velocity', v, '--resolving-power', '4000', '--json'], io)).toBe(0);
    expect(io.err).toBe('');
    const r = JSON.parse(io.out) as ElementsReport;
    expect(r).toMatchObject({ file: lampFile, resolvingPower: 4000, resolvingPowerSource: 'given', medium: 'air', telluricApplied: false });
    expect(r.velocityKmPerS).toBeCloseTo(Number(v), 12);
    expect(r.elements[0]).toMatchObject({ species: 'Ne I', element: 'Ne', verdict: 'present', strongestMatched: true });
    expect(r.elements[0].linesMatched).toBeGreaterThanOrEqual(10);
    expect(r.elements[0].linesExpected).toBeGreaterThanOrEqual(r.elements[0].linesMatched);
    expect(Object.keys(r.elements[0]).sort()).toEqual(
      ['adjustedFalseAlarmProbability', 'element', 'falseAlarmProbability', 'linesExpected', 'linesMatched', 'logLikelihoodRatio', 'missingWavelengthsAngstrom',
        'explainedBy', 'otherLinesMatched', 'rankedByIntensity', 'reason', 'reasons', 'shiftFalseAlarmProbability', 'significance', 'species', 'strongestMatched', 'verdict'].sort(),
    );
    expect(r.elements[0]).toMatchObject({ reasons: [], reason: null });
    expect(r.elements.filter((e) => e.verdict === 'present').map((e) => e.species)).toEqual(['Ne I']);
    // verdict order: present, possible, not detected
    const rank = { present: 0, possible: 1, 'not detected': 2 } as const;
    for (let i = 1; i < r.elements.length; i++) expect(rank[r.elements[i].verdict]).toBeGreaterThanOrEqual(rank[r.elements[i - 1].verdict]);
    // the lines, in wavelength order, with their identifications; Ne 6402.248 (NIST Handbook, data/linelists/Ne_I.csv) among them
    for (let i = 1; i < r.lines.length; i++) expect(r.lines[i].wavelengthAngstrom).toBeGreaterThan(r.lines[i - 1].wavelengthAngstrom);
    const l6402 = r.lines.find((l) => l.identifications[0]?.species === 'Ne I' && Math.abs(l.identifications[0].restWavelengthAngstrom - 6402.248) < 0.01);
    expect(l6402).toBeDefined();
    expect(Math.abs(l6402!.identifications[0].deltaAngstrom)).toBeLessThan(l6402!.toleranceAngstrom);
    expect(r.lines.every((l) => l.kind === 'emission')).toBe(true);
    expect(r.provenance.step).toBe('identify-lines');
  });

  it('prints a readable table and restricts the species', async () => {
    const io = capture();
    expect(await runCli(['elements', lampFile, '--velocity', lamp.velocityKmPerS.toFixed(3), '--resolving-power', '4000', '--species', 'Ne,Ar'], io)).toBe(0);
    const lines = io.out.split('\n');
    expect(lines[0]).toMatch(new RegExp(`^${lampFile.replace(/[.\\/]/g, (c) => `\\${c}`)}: \\d+ lines found; R = 4000 \\(given\\); velocity -?[0-9.]+ km/s \\(lines of present species sit [+−][0-9.]+ ± [0-9.]+ km/s off it\\); air wavelengths; 2 spectra tested$`));
    expect(io.out).toContain('  species  verdict');
    expect(io.out).toMatch(/\n {2}Ne I +present +\d+\/\d+/);
    expect(io.out).toContain('found lines (best identification):');
    expect(io.out).not.toContain('Fe I');
  });

  it('says why a species is only possible, and puts Hα down to H I, not to the weak water band around it', async () => {
    // data/samples/lvac7-star.fits: invented A-type-like star, 6300–6812 Å, Hα and Si II 6347/6371
    const file = repoPath('data', 'samples', 'lvac7-star.fits');
    const io = capture();
    expect(await runCli(['elements', file, '--velocity', '-23.4'], io)).toBe(0);
    expect(io.out).toContain('why not present');
    expect(io.out).toMatch(/\n {2}H I +possible +1\/1 .* only 1 expected line in range \(present needs 2\)/);
    expect(io.out).toMatch(/\n {2}6562\.\d\d ± \d\.\d\d +absorption +H I \(possible\)/);
    const json = capture();
    expect(await runCli(['elements', file, '--velocity', '-23.4', '--json'], json)).toBe(0);
    const r = JSON.parse(json.out) as ElementsReport;
    expect(r.elements.find((e) => e.species === 'H I')).toMatchObject({ verdict: 'possible', reasons: expect.arrayContaining(['too-few-expected-lines']) });
    const ha = r.lines.find((l) => Math.abs(l.wavelengthAngstrom - 6562.3) < 2)!;
    expect(ha.telluric).toBe(true);
    expect(ha.identifications.map((c) => c.species)).toEqual(['H I']);
  });

  it('says when the lines sit off the velocity given, and what to do when nothing matches', async () => {
    // Given 25 km/s too high at R 4000 (c/R = 75 km/s), the neon lines still match but sit
    // −25 km/s off on average: a warning names the velocity to give instead.
    const v = lamp.velocityKmPerS;
    const io = capture();
    expect(await runCli(['elements', lampFile, '--velocity', (v + 25).toFixed(3), '--resolving-power', '4000', '--json'], io)).toBe(0);
    const r = JSON.parse(io.out) as ElementsReport;
    expect(r.residualVelocity!.lines).toBeGreaterThanOrEqual(10);
    expect(Math.abs(r.residualVelocity!.valueKmPerS + 25)).toBeLessThan(3 * r.residualVelocity!.uncertaintyKmPerS + 1);
    const w = (io.logger as ReturnType<typeof collectingLogger>).warnings.find((x) => x.code === 'elements.velocity-offset')!;
    expect(w.message).toMatch(/^the identified lines sit on average −2\d\.\d ± \d+\.\d km\/s from the list wavelengths placed at [0-9.]+ km\/s \(\d+ lines\); give the object's velocity \(about [+−]?\d+\.\d km\/s\) with --velocity \(velocityKmPerS\)$/);
    const suggested = Number(w.message.match(/about ([+−]?\d+\.\d)/)![1].replace('−', '-'));
    expect(Math.abs(suggested - v)).toBeLessThan(5);
    // With the right velocity there is no such warning (the first test also checks stderr is empty).
    const right = capture();
    expect(await runCli(['elements', lampFile, '--velocity', v.toFixed(3), '--resolving-power', '4000', '--json'], right)).toBe(0);
    expect((right.logger as ReturnType<typeof collectingLogger>).warnings.map((x) => x.code)).not.toContain('elements.velocity-offset');
    // 300 km/s off, nothing matches: the table says how to find the velocity.
    const far = capture();
    expect(await runCli(['elements', lampFile, '--velocity', (v + 300).toFixed(3), '--resolving-power', '4000'], far)).toBe(0);
    expect(far.out).toContain('no species present or possible');
    expect(far.out).toMatch(/lines of an object moving more than about 34 km\/s faster or slower than that miss them: measure its velocity with `lineshift velocity` and give it with --velocity/);
  });

  it('estimates R from the line widths when not given, with a warning on stderr', async () => {
    const io = capture();
    expect(await runCli(['elements', lampFile, '--species', 'Ne', '--json'], io)).toBe(0);
    const r = JSON.parse(io.out) as ElementsReport;
    expect(r.resolvingPowerSource).toBe('line widths');
    expect(Math.abs(r.resolvingPower / 4000 - 1)).toBeLessThan(0.1);
    expect((io.logger as ReturnType<typeof collectingLogger>).warnings.map((w) => w.code)).toContain('elements.resolution-estimated');
  });

  it('answers --help with the contract', async () => {
    const io = capture();
    expect(await runCli(['elements', '--help'], io)).toBe(0);
    expect(io.out).toContain('--velocity');
    expect(io.out).toContain('--species');
    expect(io.out).toContain('--resolving-power');
    expect(io.out).toContain('--json');
  });

  it('refuses bad options and input with one message line', async () => {
    const cases: [string[], number, string][] = [
      [['elements', lampFile, '--resolving-power', '-5'], 2, 'lineshift: option --resolving-power must be > 0, got -5\n'],
      [['elements', lampFile, '--telluric', 'maybe'], 2, 'lineshift: option --telluric must be auto, on or off, got "maybe"\n'],
      [['elements', lampFile, '--species', 'Ne,Unobtainium', '--resolving-power', '4000'], 2, 'lineshift: keyword species: no line list for "Unobtainium" (known: Ar, Ca, Fe, H, He, Hg, Kr, Mg, N, Na, Ne, O, S, Si, Ti, Xe)\n'],
      [['elements', join(dir, 'missing.csv')], 1, `lineshift: ${join(dir, 'missing.csv')}: no such file\n`],
    ];
    for (const [argv, code, message] of cases) {
      const io = capture();
      expect(await runCli(argv, io), argv.join(' ')).toBe(code);
      expect(io.err).toBe(message);
      expect(io.out).toBe('');
    }
  });

  it('refuses a spectrum without a wavelength scale', async () => {
    const path = join(dir, 'pixels.csv');
    writeFileSync(path, ['pixel,flux', ...Array.from({ length: 50 }, (_, i) => `${i},${1 + 0.01 * Math.sin(i)}`)].join('\n') + '\n');
    const io = capture();
    expect(await runCli(['elements', path], io)).toBe(1);
    expect(io.err).toBe(`lineshift: ${path}: spectrum has no wavelength scale (pixel axis); calibrate it before identifying lines\n`);
  });

  it('does not modify the input file', async () => {
    const before = readFileSync(lampFile);
    await runCli(['elements', lampFile, '--species', 'Ne', '--resolving-power', '4000'], capture());
    expect(readFileSync(lampFile).equals(before)).toBe(true);
  });
});
