/**
 * Reader for the NIST StRD nonlinear-regression files (Gauss1–3, Eckerle4) and their
 * models with analytic gradients. Source of the files and the certified values: NIST
 * Information Technology Laboratory, Statistical Reference Datasets, nonlinear regression
 * (Rust 1996 for Gauss1–3; Eckerle 1979 for Eckerle4). Kept free of vitest imports so
 * that bench/ can use it too.
 */
import { readFileSync } from 'node:fs';
import type { CurveModel } from '../../src/fit/curve.js';

/** One StRD problem as stated in its file. */
export interface StrdProblem {
  name: string;
  x: number[];
  y: number[];
  /** Starting values: start[0] is "Start 1", start[1] is "Start 2". */
  start: [number[], number[]];
  certified: number[];
  certifiedSd: number[];
  certifiedSsr: number;
  model: CurveModel;
}

/** Parses a StRD .dat file: the b-lines (starts, certified value, certified SD), the residual sum of squares and the data. */
export function readStrd(path: string, name: string): StrdProblem {
  const lines = readFileSync(path, 'latin1').split(/\r?\n/);
  const s1: number[] = [], s2: number[] = [], cv: number[] = [], csd: number[] = [];
  let ssr = NaN;
  let dataStart = -1;
  lines.forEach((line, i) => {
    const b = /^\s*b(\d+)\s*=\s*(\S+)\s+(\S+)\s+(\S+)\s+(\S+)\s*$/.exec(line);
    if (b) {
      s1.push(Number(b[2])); s2.push(Number(b[3])); cv.push(Number(b[4])); csd.push(Number(b[5]));
    }
    const r = /^Residual Sum of Squares:\s+(\S+)/.exec(line);
    if (r) ssr = Number(r[1]);
    if (/^Data:\s+y\s+x\s*$/.test(line)) dataStart = i + 1;
  });
  const x: number[] = [], y: number[] = [];
  for (const line of lines.slice(dataStart)) {
    const t = line.trim().split(/\s+/);
    if (t.length === 2) { y.push(Number(t[0])); x.push(Number(t[1])); }
  }
  if (dataStart < 0 || x.length === 0 || cv.length === 0 || !Number.isFinite(ssr)) throw new Error(`${path}: not a StRD file`);
  return { name, x, y, start: [s1, s2], certified: cv, certifiedSd: csd, certifiedSsr: ssr, model: STRD_MODELS[name] };
}

/** y = b1 exp(−b2 x) + b3 exp(−(x−b4)²/b5²) + b6 exp(−(x−b7)²/b8²) (the Gauss1–3 model as stated in the files). */
const gaussModel: CurveModel = (x, b, g) => {
  const e1 = Math.exp(-b[1] * x);
  const u1 = (x - b[3]) / b[4];
  const e2 = Math.exp(-u1 * u1);
  const u2 = (x - b[6]) / b[7];
  const e3 = Math.exp(-u2 * u2);
  if (g) {
    g[0] = e1;
    g[1] = -b[0] * x * e1;
    g[2] = e2;
    g[3] = b[2] * e2 * 2 * u1 / b[4];
    g[4] = b[2] * e2 * 2 * u1 * u1 / b[4];
    g[5] = e3;
    g[6] = b[5] * e3 * 2 * u2 / b[7];
    g[7] = b[5] * e3 * 2 * u2 * u2 / b[7];
  }
  return b[0] * e1 + b[2] * e2 + b[5] * e3;
};

/** y = (b1/b2) exp(−0.5((x−b3)/b2)²) (the Eckerle4 model as stated in the file). */
const eckerleModel: CurveModel = (x, b, g) => {
  const u = (x - b[2]) / b[1];
  const e = Math.exp(-0.5 * u * u);
  const f = (b[0] / b[1]) * e;
  if (g) {
    g[0] = e / b[1];
    g[1] = -f / b[1] + f * u * u / b[1];
    g[2] = f * u / b[1];
  }
  return f;
};

const STRD_MODELS: Record<string, CurveModel> = { Gauss1: gaussModel, Gauss2: gaussModel, Gauss3: gaussModel, Eckerle4: eckerleModel };

/** Log relative error −log10(|x − c|/|c|), capped at 15 (agreement to double precision). */
export function lre(x: number, c: number): number {
  if (x === c) return 15;
  return Math.min(15, -Math.log10(Math.abs(x - c) / Math.abs(c)));
}
