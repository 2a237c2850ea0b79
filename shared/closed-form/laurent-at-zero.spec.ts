import { describe, expect, it } from 'vitest';
import { addDelayedResidues, emptyLaurent, removableAtZero } from './laurent-at-zero';

describe('Laurent coefficients at s = 0 of delayed terms', () => {
  it('cancels a ramp against a delayed ramp and keeps A(a2 − a1)', () => {
    const acc = emptyLaurent();
    addDelayedResidues(acc, [0, 2], 0.5);
    addDelayedResidues(acc, [0, -2], 1.75);
    expect(removableAtZero(acc)).toBe(true);
    expect(acc.coefficients[0]).toBeCloseTo(2 * (1.75 - 0.5), 15);
  });

  it('keeps a pole that does not cancel', () => {
    const acc = emptyLaurent();
    addDelayedResidues(acc, [0, 1], 0);
    addDelayedResidues(acc, [0, -0.5], 1);
    expect(removableAtZero(acc)).toBe(false);
  });

  it('expands e^(−as) to second order for a triple pole (1/s³ ↔ t²/2)', () => {
    // s·e^(−as)/s³ = 1/s² − a/s + a²/2 − … ; the pair 1/s³ ↔ t²/2 is from Abramowitz & Stegun, Table 29.3 (from memory).
    const acc = emptyLaurent();
    addDelayedResidues(acc, [0, 0, 1], 0.3);
    expect(acc.coefficients).toEqual([expect.closeTo(0.045, 15), expect.closeTo(-0.3, 15), 1]);
  });
});
