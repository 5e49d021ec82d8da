import { evaluateLineModel, type LineModelShape } from '../src/fit/line-model.js';
import { leastSquares } from '../src/fit/least-squares.js';
const shape: LineModelShape = { profile: 'gaussian', components: 3, continuumOrder: 1, continuumReference: 99.5 };
const x = Float64Array.from({ length: 200 }, (_, i) => i);
const p = [1, 0.001, 80, 8, -0.4, 95, 7, -0.3, 112, 9, -0.35];
const out = new Float64Array(200), jac = new Float64Array(200 * 11);
let t0 = performance.now();
for (let k = 0; k < 20000; k++) evaluateLineModel(shape, p, x, out, jac);
console.log('model+jac µs', (performance.now() - t0) / 20000 * 1000);
const y = Array.from(out, (v, i) => v + 0.02 * Math.sin(i * 1.7));
t0 = performance.now();
let it = 0;
const p0 = p.map((v, j) => (j >= 2 && (j - 2) % 3 === 0 ? v + 0.3 : v * 1.05));
for (let k = 0; k < 2000; k++) { const r = leastSquares({ residualCount: 200, evaluate(pp, res, jj) { evaluateLineModel(shape, pp, x, res, jj); for (let i = 0; i < 200; i++) res[i] = (res[i] - y[i]) * 50; for (let i = 0; i < 2200; i++) jj[i] *= 50; } }, { initial: p0 }); it += r.iterations; }
console.log('fit µs', (performance.now() - t0) / 2000 * 1000, 'steps', it / 2000);
