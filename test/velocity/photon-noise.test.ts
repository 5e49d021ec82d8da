import { describe, expect, it } from 'vitest';
import { photonNoiseLimitKmPerS } from '../../src/velocity/photon-noise.js';

describe('photonNoiseLimitKmPerS', () => {
  it('matches the closed form for one Gaussian line on a flat continuum', () => {
    // For A(λ) = C − D·exp(−(λ−λ0)²/2s²) with constant σ, Σ λ²A'² ≈ λ0² D² √π / (2 s Δλ)
    // (the integral of x² e^{−x²/s²}/s⁴ over x is √π/(2s)), giving the closed form below;
    // Bouchy, Pepe & Queloz 2001 (A&A 374, 733) eq. 12 with the sum turned into an integral.
    const lambda0 = 6000, s = 0.5, D = 400, sigma = 20, step = 0.01;
    const wl = Float64Array.from({ length: 2001 }, (_, i) => lambda0 - 10 + i * step);
    const model = wl.map((x) => 1000 - D * Math.exp(-0.5 * ((x - lambda0) / s) ** 2));
    const got = photonNoiseLimitKmPerS(wl, model, new Float64Array(wl.length).fill(sigma));
    const expected = (299792.458 * sigma) / (lambda0 * D * Math.sqrt(Math.sqrt(Math.PI) / (2 * s * step)));
    // 1e-3: finite differences and λ² varying across the line are not in the closed form.
    expect(Math.abs(got / expected - 1)).toBeLessThan(1e-3);
  });

  it('scales with the noise and ignores unusable pixels', () => {
    const wl = [5000, 5001, 5002, 5003, 5004];
    const f = [1, 0.8, 0.5, 0.8, 1];
    const a = photonNoiseLimitKmPerS(wl, f, [1, 1, 1, 1, 1]);
    expect(photonNoiseLimitKmPerS(wl, f, [2, 2, 2, 2, 2])).toBeCloseTo(2 * a, 10);
    expect(photonNoiseLimitKmPerS(wl, f, [1, NaN, 1, 1, 1])).toBeGreaterThan(a);
    expect(photonNoiseLimitKmPerS([1, 2, 3], [1, 1, 1], [1, 1, 1])).toBe(Infinity);
  });
});
