import { describe, expect, it } from 'vitest';
import { mulberry32 } from '../../src/model/random.js';

describe('mulberry32', () => {
  it('repeats with the seed and stays in [0, 1)', () => {
    const a = mulberry32(1), b = mulberry32(1), c = mulberry32(2);
    const xs = Array.from({ length: 1000 }, () => a());
    expect(xs).toEqual(Array.from({ length: 1000 }, () => b()));
    expect(xs).not.toEqual(Array.from({ length: 1000 }, () => c()));
    expect(Math.min(...xs)).toBeGreaterThanOrEqual(0);
    expect(Math.max(...xs)).toBeLessThan(1);
  });
  it('is uniform enough for Monte Carlo: mean 1/2 and variance 1/12 within 3σ of their estimates', () => {
    const r = mulberry32(12345);
    const n = 100000;
    const xs = Float64Array.from({ length: n }, () => r());
    const mean = xs.reduce((s, x) => s + x, 0) / n;
    const v = xs.reduce((s, x) => s + (x - mean) ** 2, 0) / (n - 1);
    // Uniform(0,1): mean 1/2, variance 1/12; σ of the mean estimate √(1/12/n).
    expect(Math.abs(mean - 0.5)).toBeLessThan(3 * Math.sqrt(1 / 12 / n));
    expect(Math.abs(v - 1 / 12)).toBeLessThan(0.002);
  });
});
