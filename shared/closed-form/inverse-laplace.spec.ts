import { describe, expect, it } from 'vitest';
import { evaluateInverseLaplace, inverseLaplace } from './inverse-laplace';
import { type RationalFunction } from './rational-function';

// Transform pairs from Abramowitz & Stegun, Handbook of Mathematical Functions, Table 29.3
// (formula numbers from memory; the pairs themselves are standard).
const a = 1.5;
const b = 0.7;
const w = 2.5;
const PAIRS: [string, RationalFunction, (t: number) => number][] = [
  ['29.3.1 (from memory): 1/s ↔ 1', { num: [1], den: [0, 1] }, () => 1],
  ['29.3.2 (from memory): 1/s^n ↔ t^(n−1)/(n−1)!, n = 4', { num: [1], den: [0, 0, 0, 0, 1] }, (t) => t ** 3 / 6],
  ['29.3.8 (from memory): 1/(s + a) ↔ e^(−at)', { num: [1], den: [a, 1] }, (t) => Math.exp(-a * t)],
  ['29.3.9 (from memory): 1/(s + a)^3 ↔ t² e^(−at)/2', { num: [1], den: [a ** 3, 3 * a * a, 3 * a, 1] }, (t) => (t * t * Math.exp(-a * t)) / 2],
  ['29.3.12 (from memory): 1/((s + a)(s + b)) ↔ (e^(−at) − e^(−bt))/(b − a)', { num: [1], den: [a * b, a + b, 1] }, (t) => (Math.exp(-a * t) - Math.exp(-b * t)) / (b - a)],
  ['29.3.14 (from memory): 1/(s² + ω²) ↔ sin(ωt)/ω', { num: [1], den: [w * w, 0, 1] }, (t) => Math.sin(w * t) / w],
  ['29.3.15 (from memory): s/(s² + ω²) ↔ cos(ωt)', { num: [0, 1], den: [w * w, 0, 1] }, (t) => Math.cos(w * t)],
  ['29.3.18 (from memory): 1/((s + a)² + ω²) ↔ e^(−at) sin(ωt)/ω', { num: [1], den: [a * a + w * w, 2 * a, 1] }, (t) => (Math.exp(-a * t) * Math.sin(w * t)) / w],
  ['(s + a)/((s + a)² + ω²) ↔ e^(−at) cos(ωt)', { num: [a, 1], den: [a * a + w * w, 2 * a, 1] }, (t) => Math.exp(-a * t) * Math.cos(w * t)],
  ['29.3.27 (from memory): 1/(s² + ω²)² ↔ (sin ωt − ωt cos ωt)/(2ω³)', { num: [1], den: [w ** 4, 0, 2 * w * w, 0, 1] }, (t) => (Math.sin(w * t) - w * t * Math.cos(w * t)) / (2 * w ** 3)],
  ['29.3.28 (from memory): s/(s² + ω²)² ↔ t sin(ωt)/(2ω)', { num: [0, 1], den: [w ** 4, 0, 2 * w * w, 0, 1] }, (t) => (t * Math.sin(w * t)) / (2 * w)],
  ['1/(s(s + a)) ↔ (1 − e^(−at))/a', { num: [1], den: [0, a, 1] }, (t) => (1 - Math.exp(-a * t)) / a],
];

describe('inverseLaplace against handbook pairs (Abramowitz & Stegun, Table 29.3)', () => {
  it.each(PAIRS)('%s', (_name, F, f) => {
    const inv = inverseLaplace(F);
    expect(inv.ok).toBe(true);
    if (!inv.ok) return;
    for (const t of [0.01, 0.3, 1, 2.2, 5, 9.7]) {
      expect(evaluateInverseLaplace(inv.value, t)).toBeCloseTo(f(t), 11);
    }
  });

  it('shift rule in s: F(s + c) ↔ e^(−ct) f(t) (Abramowitz & Stegun 29.2.12, from memory)', () => {
    const c = 0.4;
    // 1/s² → 1/(s + c)²
    const inv = inverseLaplace({ num: [1], den: [c * c, 2 * c, 1] });
    if (!inv.ok) throw new Error('inversion failed');
    for (const t of [0.5, 2, 7]) expect(evaluateInverseLaplace(inv.value, t)).toBeCloseTo(Math.exp(-c * t) * t, 12);
  });

  it('derivative rule: L{f′} = sF − f(0−) (Abramowitz & Stegun 29.2.4, from memory)', () => {
    // f = sin ωt: sF − 0 = ωs/(s² + ω²) ↔ ω cos ωt = f′
    const inv = inverseLaplace({ num: [0, w], den: [w * w, 0, 1] });
    if (!inv.ok) throw new Error('inversion failed');
    for (const t of [0.1, 1.3, 4]) expect(evaluateInverseLaplace(inv.value, t)).toBeCloseTo(w * Math.cos(w * t), 12);
  });

  it('reports an improper part as explicit impulses, not dropped', () => {
    // (s² + 3s + 3)/(s + 1) = s + 2 + 1/(s + 1) ↔ δ′(t) + 2δ(t) + e^(−t)
    const inv = inverseLaplace({ num: [3, 3, 1], den: [1, 1] });
    if (!inv.ok) throw new Error('inversion failed');
    expect(inv.value.impulses).toEqual([2, 1]);
    expect(evaluateInverseLaplace(inv.value, 0.5)).toBeCloseTo(Math.exp(-0.5), 14);
  });

  it('refuses a zero denominator', () => {
    expect(inverseLaplace({ num: [1], den: [0] }).ok).toBe(false);
  });
});
