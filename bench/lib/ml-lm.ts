/**
 * A guarded adapter around ml-levenberg-marquardt 5.1.0 for the benchmarks that compare
 * it with our solver. It whitens the data itself (fits y/σ against the model divided by
 * σ with the pixel index as x), because the library's `weights` option does not give a
 * weighted least-squares solution (DESIGN.md, "Library facts"). Any exception becomes
 * `{converged: false, reason}`.
 */
import { levenbergMarquardt } from 'ml-levenberg-marquardt';
import type { CurveModel } from '../../src/fit/curve.js';

export interface MlLmOutcome {
  converged: boolean;
  reason: string;
  parameters: number[];
  chiSquare: number;
  iterations: number;
}

export function fitWithMlLm(
  data: { x: ArrayLike<number>; y: ArrayLike<number>; sigma?: ArrayLike<number> },
  model: CurveModel,
  initial: number[],
  options: { maxIterations?: number; analyticJacobian?: boolean; errorTolerance?: number } = {},
): MlLmOutcome {
  const m = data.x.length;
  const n = initial.length;
  const idx = Array.from({ length: m }, (_, i) => i);
  const inv = Float64Array.from({ length: m }, (_, i) => (data.sigma ? 1 / data.sigma[i] : 1));
  const yw = idx.map((i) => data.y[i] * inv[i]);
  const grad = new Float64Array(n);
  const pf = new Float64Array(n);
  const maxIterations = options.maxIterations ?? 100;
  try {
    const out = levenbergMarquardt(
      { x: idx, y: yw },
      (p) => { pf.set(p); return (i: number) => model(data.x[i], pf, null) * inv[i]; },
      {
        initialValues: initial,
        maxIterations,
        errorTolerance: options.errorTolerance ?? 1e-12,
        ...(options.analyticJacobian === false ? {} : {
          jacobianFunction: (p: number[]) => {
            const q = Float64Array.from(p);
            return (i: number) => { grad.fill(0); model(data.x[i], q, grad); return Array.from(grad, (g) => g * inv[i]); };
          },
        }),
      },
    );
    const ok = out.parameterValues.every(Number.isFinite) && Number.isFinite(out.parameterError);
    return {
      // The library has no convergence test: it reports success only if the error fell below errorTolerance.
      converged: ok && out.iterations < maxIterations,
      reason: !ok ? 'non-finite result' : out.iterations < maxIterations ? 'error below tolerance' : 'ran every iteration (no convergence test)',
      parameters: out.parameterValues,
      chiSquare: out.parameterError,
      iterations: out.iterations,
    };
  } catch (e) {
    return { converged: false, reason: `threw: ${(e as Error).message}`, parameters: initial.map(() => NaN), chiSquare: NaN, iterations: 0 };
  }
}
