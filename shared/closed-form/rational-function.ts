import { divideComplex, type Complex } from './complex-number';
import {
  addPolynomials,
  divideByPowerOfS,
  evaluatePolynomialComplex,
  leadingCoefficient,
  multiplyPolynomials,
  polynomialDegree,
  scalePolynomial,
  trimPolynomial,
  zeroRootCount,
  type Polynomial,
} from './polynomial';

/** A real rational function num(s)/den(s) in s. */
export interface RationalFunction {
  num: number[];
  den: number[];
}

/** @example rational([1], [1, 1]) // 1/(s + 1) */
export function rational(num: Polynomial, den: Polynomial): RationalFunction {
  return { num: trimPolynomial(num), den: trimPolynomial(den) };
}

/** a·b, with common factors of s cancelled exactly. */
export function multiplyRational(a: RationalFunction, b: RationalFunction): RationalFunction {
  return cancelZeroRoots({ num: multiplyPolynomials(a.num, b.num), den: multiplyPolynomials(a.den, b.den) });
}

/** a + b over the product of the denominators, common factors of s cancelled exactly. */
export function addRational(a: RationalFunction, b: RationalFunction): RationalFunction {
  const num = addPolynomials(multiplyPolynomials(a.num, b.den), multiplyPolynomials(b.num, a.den));
  return cancelZeroRoots({ num, den: multiplyPolynomials(a.den, b.den) });
}

/** k·a for real k. */
export function scaleRational(a: RationalFunction, k: number): RationalFunction {
  return { num: scalePolynomial(a.num, k), den: a.den.slice() };
}

/** F(z) at a complex point. @example evaluateRationalComplex({ num: [1], den: [0, 1] }, { re: 0, im: 1 }) // { re: 0, im: -1 } */
export function evaluateRationalComplex(f: RationalFunction, z: Complex): Complex {
  return divideComplex(evaluatePolynomialComplex(f.num, z), evaluatePolynomialComplex(f.den, z));
}

/**
 * Cancels the common factor s^k exactly (coefficients shift; no roundoff), so a pole at the
 * origin that the numerator removes cannot leak into a verdict.
 * @example cancelZeroRoots({ num: [0, 1], den: [0, 2, 1] }) // { num: [1], den: [2, 1] }
 */
export function cancelZeroRoots(f: RationalFunction): RationalFunction {
  if (polynomialDegree(f.num) < 0) return { num: [0], den: trimPolynomial(f.den) };
  const k = Math.min(zeroRootCount(f.num), zeroRootCount(f.den));
  return k === 0 ? { num: trimPolynomial(f.num), den: trimPolynomial(f.den) } : { num: divideByPowerOfS(f.num, k), den: divideByPowerOfS(f.den, k) };
}

/** lim F(s) as s → ∞: finite (0 or the ratio of leading coefficients) or unbounded. */
export type LimitAtInfinity = { finite: true; value: number } | { finite: false };

/** @example limitAtInfinity({ num: [1, 3], den: [1, 1] }) // { finite: true, value: 3 } */
export function limitAtInfinity(f: RationalFunction): LimitAtInfinity {
  const dn = polynomialDegree(f.num);
  const dd = polynomialDegree(f.den);
  if (dn < dd) return { finite: true, value: 0 };
  if (dn === dd) return { finite: true, value: leadingCoefficient(f.num) / leadingCoefficient(f.den) };
  return { finite: false };
}

/** F(0) when finite (after exact cancellation of s^k), else null: the DC gain of a transfer function. @example valueAtZero({ num: [2], den: [4, 1] }) // 0.5 */
export function valueAtZero(f: RationalFunction): number | null {
  const c = cancelZeroRoots(f);
  if (polynomialDegree(c.num) < 0) return 0;
  if (c.den[0] === 0) return null;
  return c.num[0]! / c.den[0]!;
}
