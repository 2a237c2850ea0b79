import { type Parsed } from '../validation/field-errors';
import { type Complex } from './complex-number';
import { partialFractions } from './partial-fractions';
import { clusterPoles, sharpenRepeatedRoots } from './pole-clusters';
import { leadingCoefficient, polynomialDegree, trimPolynomial } from './polynomial';
import { polynomialRoots } from './polynomial-roots';
import { type RationalFunction } from './rational-function';

/** f(t) = Σ_modes Σ_j c_j t^j e^(pole·t) (pairs: 2·Re) + Σ_k impulses[k]·δ^(k)(t), for t ≥ 0. */
export interface InverseLaplace {
  modes: { pole: Complex; multiplicity: number; coefficients: Complex[] }[];
  impulses: number[];
}

/**
 * Inverse Laplace transform of any real rational function by partial fractions (roots by
 * Aberth, repeated poles grouped, exact residues, the improper part as impulses).
 * @example inverseLaplace({ num: [1], den: [0, 0, 1] }) // 1/s² ↔ t: one mode at 0 with c = [0, 1]
 */
export function inverseLaplace(f: RationalFunction): Parsed<InverseLaplace> {
  const den = trimPolynomial(f.den);
  if (polynomialDegree(den) < 0) return { ok: false, errors: [{ field: 'den', message: 'the denominator must not be the zero polynomial' }] };
  const roots = polynomialRoots(den);
  if (!roots.ok) return { ok: false, errors: [{ field: 'den', message: roots.reason }] };
  const expansion = partialFractions(f.num, leadingCoefficient(den), clusterPoles(sharpenRepeatedRoots(den, roots.roots)));
  let fact = 1;
  const factorials = [1];
  for (let j = 1; j < 32; j++) factorials.push((fact *= j));
  return {
    ok: true,
    value: {
      modes: expansion.poles.map((p) => ({
        pole: p.pole,
        multiplicity: p.multiplicity,
        coefficients: p.residues.map((r, j) => ({ re: r.re / factorials[j]!, im: p.pole.im === 0 ? 0 : r.im / factorials[j]! })),
      })),
      impulses: expansion.polynomialPart,
    },
  };
}

/** The regular part of an InverseLaplace at t > 0 (impulses are not point values). */
export function evaluateInverseLaplace(f: InverseLaplace, t: number): number {
  let sum = 0;
  for (const m of f.modes) {
    const e = Math.exp(m.pole.re * t);
    const c = Math.cos(m.pole.im * t);
    const s = Math.sin(m.pole.im * t);
    let tp = 1;
    for (const k of m.coefficients) {
      sum += m.pole.im === 0 ? k.re * tp * e : 2 * tp * e * (k.re * c - k.im * s);
      tp *= t;
    }
  }
  return sum;
}
