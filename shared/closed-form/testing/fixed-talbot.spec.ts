import { describe, expect, it } from 'vitest';
import { addComplex, divideComplex, multiplyComplex, type Complex } from '../complex-number';
import { fixedTalbot } from './fixed-talbot';

// The reference inverter checked on its own against handbook pairs (Abramowitz & Stegun,
// Table 29.3, from memory) before it is trusted to check the engine (Abate & Whitt 2006 report
// roughly 0.6·M significant digits for the fixed Talbot method, limited by double precision).
const one: Complex = { re: 1, im: 0 };
const c = (re: number): Complex => ({ re, im: 0 });

describe('fixed Talbot inversion (Abate & Whitt 2006)', () => {
  it.each([
    ['1/(s + 1) ↔ e^(−t)', (s: Complex) => divideComplex(one, addComplex(s, one)), (t: number) => Math.exp(-t)],
    ['1/s² ↔ t', (s: Complex) => divideComplex(one, multiplyComplex(s, s)), (t: number) => t],
    ['2/(s² + 4) ↔ sin 2t', (s: Complex) => divideComplex(c(2), addComplex(multiplyComplex(s, s), c(4))), (t: number) => Math.sin(2 * t)],
    ['1/(s + 2)³ ↔ t² e^(−2t)/2', (s: Complex) => divideComplex(one, multiplyComplex(addComplex(s, c(2)), multiplyComplex(addComplex(s, c(2)), addComplex(s, c(2))))), (t: number) => (t * t * Math.exp(-2 * t)) / 2],
  ])('%s', (_name, F, f) => {
    for (const t of [0.05, 0.5, 1, 2.5, 4]) expect(Math.abs(fixedTalbot(F, t, 40) - f(t))).toBeLessThan(1e-9);
  });
});
