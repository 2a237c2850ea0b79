import { divideComplex, multiplyComplex, type Complex } from './complex-number';
import { dividePolynomials, polynomialDegree, polynomialFromRoots, trimPolynomial, type Polynomial } from './polynomial';
import { type PoleCluster } from './pole-clusters';

/** The residues at one pole: residues[j] multiplies 1/(s − pole)^(j+1). */
export interface PoleResidues {
  pole: Complex;
  multiplicity: number;
  residues: Complex[];
}

/**
 * num(s) / (lead·Π(s − p)^m) = polynomialPart(s) + Σ_p Σ_j r_pj/(s − p)^j. Only poles with
 * im ≥ 0 are listed; a pole with im > 0 stands for its conjugate too (residues conjugate).
 */
export interface PartialFractionExpansion {
  /** Ascending coefficients of the improper part; [0] when the function is strictly proper. */
  polynomialPart: number[];
  /** Numerator of the strictly proper remainder (over the same denominator). */
  properNumerator: number[];
  poles: PoleResidues[];
}

/**
 * Partial fractions of num(s)/(lead·Π(s − center)^multiplicity) by Taylor expansion at each pole:
 * r_p,j is the (m−j)-th Taylor coefficient of (s − p)^m·F(s), exact for repeated poles.
 * `clusters` must be closed under conjugation (as clusterPoles returns them).
 * @example partialFractions([1], 1, [{ center: { re: -1, im: 0 }, multiplicity: 2 }]) // r = [0, 1]: 1/(s+1)²
 */
export function partialFractions(num: Polynomial, lead: number, clusters: readonly PoleCluster[]): PartialFractionExpansion {
  const order = clusters.reduce((sum, c) => sum + c.multiplicity, 0);
  let proper = trimPolynomial(num);
  let polynomialPart = [0];
  if (polynomialDegree(proper) >= order) {
    const roots: Complex[] = [];
    for (const c of clusters) for (let k = 0; k < c.multiplicity; k++) roots.push(c.center);
    const division = dividePolynomials(proper, polynomialFromRoots(roots, lead));
    polynomialPart = division.quotient;
    proper = division.remainder;
  }
  const poles: PoleResidues[] = [];
  for (const cluster of clusters) {
    if (cluster.center.im < 0) continue;
    poles.push({ pole: cluster.center, multiplicity: cluster.multiplicity, residues: residuesAt(proper, lead, cluster, clusters) });
  }
  return { polynomialPart, properNumerator: proper, poles };
}

function residuesAt(num: readonly number[], lead: number, at: PoleCluster, all: readonly PoleCluster[]): Complex[] {
  const m = at.multiplicity;
  const c = at.center;
  const series = taylorOfPolynomial(num, c, m);
  for (const other of all) {
    if (other === at) continue;
    multiplySeriesInPlace(series, inversePowerSeries({ re: c.re - other.center.re, im: c.im - other.center.im }, other.multiplicity, m));
  }
  const residues: Complex[] = [];
  for (let j = 0; j < m; j++) {
    const g = series[m - 1 - j]!;
    residues.push({ re: g.re / lead, im: g.im / lead });
  }
  return residues;
}

/** First `count` Taylor coefficients of p at c, by repeated synthetic division by (s − c). */
function taylorOfPolynomial(p: readonly number[], c: Complex, count: number): Complex[] {
  let br = p.slice();
  let bi = p.map(() => 0);
  const out: Complex[] = [];
  for (let k = 0; k < count; k++) {
    const n = br.length;
    if (n === 0) {
      out.push({ re: 0, im: 0 });
      continue;
    }
    const qr = new Array<number>(Math.max(n - 1, 0));
    const qi = new Array<number>(Math.max(n - 1, 0));
    let ar = br[n - 1]!;
    let ai = bi[n - 1]!;
    for (let i = n - 2; i >= 0; i--) {
      qr[i] = ar;
      qi[i] = ai;
      const nr = ar * c.re - ai * c.im + br[i]!;
      ai = ar * c.im + ai * c.re + bi[i]!;
      ar = nr;
    }
    out.push({ re: ar, im: ai });
    br = qr;
    bi = qi;
  }
  return out;
}

/** Taylor coefficients in h of (d + h)^(−power): d^(−power)·Σ C(−power, k)(h/d)^k. */
function inversePowerSeries(d: Complex, power: number, count: number): Complex[] {
  let base: Complex = { re: 1, im: 0 };
  const inv = divideComplex({ re: 1, im: 0 }, d);
  for (let k = 0; k < power; k++) base = multiplyComplex(base, inv);
  const out: Complex[] = [base];
  for (let k = 1; k < count; k++) {
    const prev = out[k - 1]!;
    const factor = -(power + k - 1) / k;
    const next = multiplyComplex(prev, inv);
    out.push({ re: next.re * factor, im: next.im * factor });
  }
  return out;
}

function multiplySeriesInPlace(acc: Complex[], by: readonly Complex[]): void {
  for (let k = acc.length - 1; k >= 0; k--) {
    let re = 0;
    let im = 0;
    for (let i = 0; i <= k; i++) {
      const a = acc[i]!;
      const b = by[k - i]!;
      re += a.re * b.re - a.im * b.im;
      im += a.re * b.im + a.im * b.re;
    }
    acc[k] = { re, im };
  }
}
