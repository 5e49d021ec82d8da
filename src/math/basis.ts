import { UsageError } from '../errors.js';

/**
 * Maps x from [min, max] onto [−1, 1], the domain where Chebyshev polynomials are well
 * conditioned.
 */
export interface Domain {
  readonly min: number;
  readonly max: number;
}

/** The scaled coordinate t = (2x − max − min)/(max − min) ∈ [−1, 1]. */
export function toUnitInterval(x: number, d: Domain): number {
  return (2 * x - d.max - d.min) / (d.max - d.min);
}

/**
 * Chebyshev polynomials of the first kind T₀…T_order at x scaled to [−1, 1], written into
 * `out` (length order+1). The recurrence T_{k+1} = 2tT_k − T_{k−1} is stable on [−1, 1]
 * (Press et al., Numerical Recipes, 3rd ed., §5.8).
 */
export function chebyshevRow(x: number, order: number, d: Domain, out: Float64Array = new Float64Array(order + 1)): Float64Array {
  const t = toUnitInterval(x, d);
  out[0] = 1;
  if (order >= 1) out[1] = t;
  for (let k = 2; k <= order; k++) out[k] = 2 * t * out[k - 1] - out[k - 2];
  return out;
}

/** Evaluates Σ cₖ Tₖ(t) by Clenshaw's recurrence. */
export function chebyshevEvaluate(coefficients: ArrayLike<number>, x: number, d: Domain): number {
  const t = toUnitInterval(x, d);
  let b1 = 0;
  let b2 = 0;
  for (let k = coefficients.length - 1; k >= 1; k--) {
    const b0 = 2 * t * b1 - b2 + coefficients[k];
    b2 = b1;
    b1 = b0;
  }
  return t * b1 - b2 + coefficients[0];
}

/** Derivative d/dx of Σ cₖ Tₖ(t(x)), using dTₖ/dt = k·Uₖ₋₁(t) (Chebyshev polynomials of the second kind). */
export function chebyshevDerivative(coefficients: ArrayLike<number>, x: number, d: Domain): number {
  const t = toUnitInterval(x, d);
  let uPrev = 0; // U_{k-2}, with U_{-1} = 0
  let uCur = 1; // U_{k-1}, starting at U_0 = 1
  let s = 0;
  for (let k = 1; k < coefficients.length; k++) {
    s += coefficients[k] * k * uCur;
    const uNext = 2 * t * uCur - uPrev;
    uPrev = uCur;
    uCur = uNext;
  }
  return (s * 2) / (d.max - d.min);
}

/**
 * Uniform cubic B-spline basis on [min, max] with `intervals` equal intervals
 * (intervals + 3 basis functions). `row(x, out)` writes the basis values at x; at most
 * four are non-zero. De Boor, A Practical Guide to Splines (1978): uniform cubic B-spline
 * pieces.
 */
export class CubicBSplineBasis {
  readonly size: number;
  constructor(readonly min: number, readonly max: number, readonly intervals: number) {
    if (!(max > min) || !(intervals >= 1) || !Number.isInteger(intervals)) {
      throw new UsageError('spline.bad-domain', `a spline needs max > min and a whole number of intervals ≥ 1 (got [${min}, ${max}], ${intervals})`);
    }
    this.size = intervals + 3;
  }

  /** Index of the first non-zero basis function at x, and the four values. */
  local(x: number): { first: number; values: [number, number, number, number] } {
    const h = (this.max - this.min) / this.intervals;
    let u = (x - this.min) / h;
    let k = Math.floor(u);
    if (k < 0) k = 0;
    if (k > this.intervals - 1) k = this.intervals - 1;
    u -= k;
    const v = 1 - u;
    return {
      first: k,
      values: [(v * v * v) / 6, (3 * u * u * u - 6 * u * u + 4) / 6, (-3 * u * u * u + 3 * u * u + 3 * u + 1) / 6, (u * u * u) / 6],
    };
  }

  /** All basis values at x (length `size`). */
  row(x: number, out: Float64Array = new Float64Array(this.size)): Float64Array {
    out.fill(0);
    const { first, values } = this.local(x);
    for (let i = 0; i < 4; i++) out[first + i] = values[i];
    return out;
  }

  /** Σ cᵢ Bᵢ(x). */
  evaluate(coefficients: ArrayLike<number>, x: number): number {
    const { first, values } = this.local(x);
    return coefficients[first] * values[0] + coefficients[first + 1] * values[1] + coefficients[first + 2] * values[2] + coefficients[first + 3] * values[3];
  }
}
