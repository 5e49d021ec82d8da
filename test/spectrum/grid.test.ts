import { describe, expect, it } from 'vitest';
import { InputError, UsageError } from '../../src/errors.js';
import { SPEED_OF_LIGHT_KM_PER_S } from '../../src/spectrum/constants.js';
import { binEdges, linearGrid, logGridVelocityStepKmPerS, logLinearGrid } from '../../src/spectrum/grid.js';

describe('linearGrid', () => {
  it('makes centres start + i·step up to end, with half-step bins', () => {
    const g = linearGrid({ start: 6500, end: 6600, step: 0.5 });
    expect(g.wavelength.length).toBe(201);
    expect(g.wavelength[200]).toBe(6600);
    expect(g.edges.length).toBe(202);
    expect(g.edges[0]).toBe(6499.75);
    expect(g.edges[201]).toBe(6600.25);
    expect(g.unit).toBe('angstrom');
    expect(g.spacing).toBe('linear');
  });

  it('takes a count instead of a step, and a unit', () => {
    const g = linearGrid({ start: 400, end: 700, count: 4, unit: 'nm' });
    expect(Array.from(g.wavelength)).toEqual([400, 500, 600, 700]);
    expect(g.step).toBe(100);
    expect(g.unit).toBe('nm');
  });

  it('does not let an inexact step drop the last centre', () => {
    // Reference: IEEE 754 double rounding (common practice for grid builders).
    // 0.1 is not exact in binary; (6600 − 6500)/0.1 = 999.9999999999… must still give 1001 centres.
    expect(linearGrid({ start: 6500, end: 6600, step: 0.1 }).wavelength.length).toBe(1001);
  });

  it('rejects bad calls with UsageErrors', () => {
    expect(() => linearGrid({ start: 2, end: 1, step: 1 })).toThrow("the grid's end (1 Angstrom) must be above its start (2 Angstrom)");
    expect(() => linearGrid({ start: 1, end: 2 })).toThrow('give exactly one of step and count');
    expect(() => linearGrid({ start: 1, end: 2, step: 1, count: 2 })).toThrow(UsageError);
    expect(() => linearGrid({ start: 1, end: 2, step: -1 })).toThrow('the grid step must be a positive number (got -1)');
    expect(() => linearGrid({ start: 1, end: 2, count: 1 })).toThrow('the grid needs an integer count of at least 2 pixels (got 1)');
    expect(() => linearGrid({ start: 1, end: 1e9, step: 1 })).toThrow('larger than the limit of 10000000');
  });
});

describe('logLinearGrid', () => {
  it('has a constant step in ln λ equal to v/c (c = 299 792.458 km/s, exact SI)', () => {
    const g = logLinearGrid({ start: 4000, end: 7000, velocityStepKmPerS: 10 });
    expect(g.logStep).toBe(10 / 299_792.458);
    expect(g.velocityStepKmPerS).toBeCloseTo(10, 12);
    const n = g.wavelength.length;
    expect(n).toBe(Math.floor(Math.log(7000 / 4000) / (10 / SPEED_OF_LIGHT_KM_PER_S)) + 1);
    expect(g.wavelength[n - 1]).toBeLessThanOrEqual(7000);
    for (let i = 1; i < n; i++) expect(Math.log(g.wavelength[i] / g.wavelength[i - 1])).toBeCloseTo(g.logStep!, 14);
    // Bins: geometric midpoints.
    expect(g.edges[1]).toBeCloseTo(Math.sqrt(g.wavelength[0] * g.wavelength[1]), 9);
    expect(logGridVelocityStepKmPerS(g.wavelength)).toBeCloseTo(10, 9);
  });

  it('takes a count', () => {
    const g = logLinearGrid({ start: 4000, end: 8000, count: 3 });
    expect(g.wavelength[1]).toBeCloseTo(4000 * Math.SQRT2, 9);
    expect(g.wavelength[2]).toBe(8000);
    expect(g.velocityStepKmPerS).toBeCloseTo((Math.LN2 / 2) * 299_792.458, 6);
  });

  it('rejects a non-positive start', () => {
    expect(() => logLinearGrid({ start: 0, end: 10, count: 3 })).toThrow('a log-linear grid needs a positive start (got 0)');
  });
});

describe('logGridVelocityStepKmPerS', () => {
  it('works for a decreasing axis and refuses a linear one', () => {
    const g = logLinearGrid({ start: 5000, end: 6000, velocityStepKmPerS: 3 });
    expect(logGridVelocityStepKmPerS(g.wavelength.slice().reverse())).toBeCloseTo(3, 9);
    expect(() => logGridVelocityStepKmPerS(linearGrid({ start: 5000, end: 6000, step: 1 }).wavelength)).toThrow(InputError);
    expect(() => logGridVelocityStepKmPerS([1])).toThrow(UsageError);
  });
});

describe('binEdges', () => {
  it('puts edges halfway between centres and half a step beyond the ends, in either order', () => {
    expect(Array.from(binEdges([1, 2, 4]))).toEqual([0.5, 1.5, 3, 5]);
    expect(Array.from(binEdges([4, 2, 1]))).toEqual([5, 3, 1.5, 0.5]);
  });
});
