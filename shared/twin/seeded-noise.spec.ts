import { describe, expect, it } from 'vitest';
import { gaussianSource, mulberry32 } from './seeded-noise';

describe('seeded noise', () => {
  it('repeats a sequence for a seed and differs for another', () => {
    const a = mulberry32(2024);
    const b = mulberry32(2024);
    const c = mulberry32(2025);
    const seqA = Array.from({ length: 5 }, () => a());
    expect(Array.from({ length: 5 }, () => b())).toEqual(seqA);
    expect(Array.from({ length: 5 }, () => c())).not.toEqual(seqA);
    expect(seqA.every((u) => u >= 0 && u < 1)).toBe(true);
  });

  it('gives standard normal deviates: mean 0 and variance 1 within sampling error', () => {
    // For N = 20000 draws the standard error of the mean is 1/√N ≈ 0.007 and of the variance
    // √(2/N) ≈ 0.01 (common practice); the bounds are four of those.
    const g = gaussianSource(7);
    const n = 20000;
    let sum = 0;
    let squares = 0;
    let beyondTwo = 0;
    for (let i = 0; i < n; i++) {
      const x = g.next();
      sum += x;
      squares += x * x;
      if (Math.abs(x) > 2) beyondTwo++;
    }
    const mean = sum / n;
    expect(Math.abs(mean)).toBeLessThan(0.03);
    expect(Math.abs(squares / n - mean * mean - 1)).toBeLessThan(0.04);
    // P(|X| > 2) = 0.0455 for a normal variable (Abramowitz & Stegun, Table 26.1).
    expect(Math.abs(beyondTwo / n - 0.0455)).toBeLessThan(0.006);
  });
});
