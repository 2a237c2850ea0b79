import { type Complex } from './complex-number';

/**
 * A real polynomial in s as its coefficients in ascending powers: [c0, c1, c2] is c0 + c1·s + c2·s².
 * The zero polynomial is [0]; trailing zeros are trimmed by every operation here.
 */
export type Polynomial = readonly number[];

/** Drops exact trailing zeros so the last coefficient is the leading one. @example trimPolynomial([1, 2, 0]) // [1, 2] */
export function trimPolynomial(p: Polynomial): number[] {
  let n = p.length;
  while (n > 1 && p[n - 1] === 0) n--;
  return n === 0 ? [0] : p.slice(0, n);
}

/** Degree of p; the zero polynomial has degree −1. @example polynomialDegree([1, 0, 3]) // 2 */
export function polynomialDegree(p: Polynomial): number {
  const t = trimPolynomial(p);
  return t.length === 1 && t[0] === 0 ? -1 : t.length - 1;
}

/** True for the zero polynomial. */
export function isZeroPolynomial(p: Polynomial): boolean {
  return polynomialDegree(p) < 0;
}

/** Coefficient of the highest power (0 for the zero polynomial). @example leadingCoefficient([1, 0, 4]) // 4 */
export function leadingCoefficient(p: Polynomial): number {
  const t = trimPolynomial(p);
  return t[t.length - 1]!;
}

/** @example addPolynomials([1, 1], [0, 0, 2]) // [1, 1, 2] */
export function addPolynomials(a: Polynomial, b: Polynomial): number[] {
  const out = new Array<number>(Math.max(a.length, b.length)).fill(0);
  for (let i = 0; i < a.length; i++) out[i]! += a[i]!;
  for (let i = 0; i < b.length; i++) out[i]! += b[i]!;
  return trimPolynomial(out);
}

/** a − b. @example subtractPolynomials([1, 2], [1]) // [0, 2] */
export function subtractPolynomials(a: Polynomial, b: Polynomial): number[] {
  return addPolynomials(a, scalePolynomial(b, -1));
}

/** @example multiplyPolynomials([1, 1], [-1, 1]) // [-1, 0, 1] (s² − 1) */
export function multiplyPolynomials(a: Polynomial, b: Polynomial): number[] {
  const out = new Array<number>(a.length + b.length - 1).fill(0);
  for (let i = 0; i < a.length; i++) {
    const ai = a[i]!;
    if (ai === 0) continue;
    for (let j = 0; j < b.length; j++) out[i + j]! += ai * b[j]!;
  }
  return trimPolynomial(out);
}

/** k·p. @example scalePolynomial([1, 2], 3) // [3, 6] */
export function scalePolynomial(p: Polynomial, k: number): number[] {
  return trimPolynomial(p.map((c) => c * k));
}

/** p(x) for real x by Horner's rule. @example evaluatePolynomial([1, 0, 1], 2) // 5 */
export function evaluatePolynomial(p: Polynomial, x: number): number {
  let acc = 0;
  for (let i = p.length - 1; i >= 0; i--) acc = acc * x + p[i]!;
  return acc;
}

/** p(z) for complex z by Horner's rule. */
export function evaluatePolynomialComplex(p: Polynomial, z: Complex): Complex {
  let re = 0;
  let im = 0;
  for (let i = p.length - 1; i >= 0; i--) {
    const nr = re * z.re - im * z.im + p[i]!;
    im = re * z.im + im * z.re;
    re = nr;
  }
  return { re, im };
}

/** dp/ds. @example derivativeOfPolynomial([5, 3, 2]) // [3, 4] */
export function derivativeOfPolynomial(p: Polynomial): number[] {
  if (p.length <= 1) return [0];
  return trimPolynomial(p.slice(1).map((c, i) => c * (i + 1)));
}

/**
 * Long division n = q·d + r with deg r < deg d.
 * @example dividePolynomials([-1, 0, 1], [1, 1]) // { quotient: [-1, 1], remainder: [0] }
 */
export function dividePolynomials(n: Polynomial, d: Polynomial): { quotient: number[]; remainder: number[] } {
  const den = trimPolynomial(d);
  const dd = den.length - 1;
  const lead = den[dd]!;
  if (dd < 0 || lead === 0) throw new RangeError('division by the zero polynomial');
  const rem = trimPolynomial(n).slice();
  const dn = rem.length - 1;
  if (dn < dd) return { quotient: [0], remainder: rem };
  const q = new Array<number>(dn - dd + 1).fill(0);
  for (let k = dn - dd; k >= 0; k--) {
    const c = rem[k + dd]! / lead;
    q[k] = c;
    for (let j = 0; j <= dd; j++) rem[k + j]! -= c * den[j]!;
    rem[k + dd] = 0; // exact by construction; roundoff would otherwise leave a ghost leading term
  }
  return { quotient: trimPolynomial(q), remainder: trimPolynomial(rem.slice(0, Math.max(dd, 1))) };
}

/** How many exact zero roots p has (its lowest non-zero power). @example zeroRootCount([0, 0, 3, 1]) // 2 */
export function zeroRootCount(p: Polynomial): number {
  const t = trimPolynomial(p);
  let k = 0;
  while (k < t.length - 1 && t[k] === 0) k++;
  return k;
}

/** p / s^k for a p with at least k exact zero roots. @example divideByPowerOfS([0, 0, 3], 2) // [3] */
export function divideByPowerOfS(p: Polynomial, k: number): number[] {
  return trimPolynomial(p.slice(k));
}

/**
 * The real polynomial lead·Π(s − root) from a root list closed under conjugation
 * (each pair appears once per member); imaginary roundoff is discarded.
 * @example polynomialFromRoots([{ re: 0, im: 1 }, { re: 0, im: -1 }], 2) // [2, 0, 2]
 */
export function polynomialFromRoots(roots: readonly Complex[], lead = 1): number[] {
  let re = [1];
  let im = [0];
  for (const r of roots) {
    const nre = new Array<number>(re.length + 1).fill(0);
    const nim = new Array<number>(re.length + 1).fill(0);
    for (let i = 0; i < re.length; i++) {
      nre[i + 1]! += re[i]!;
      nim[i + 1]! += im[i]!;
      nre[i]! -= r.re * re[i]! - r.im * im[i]!;
      nim[i]! -= r.re * im[i]! + r.im * re[i]!;
    }
    re = nre;
    im = nim;
  }
  return trimPolynomial(re.map((c) => c * lead));
}
