import { type Complex } from '../closed-form/complex-number';
import { polynomialRoots } from '../closed-form/polynomial-roots';
import { evaluateRationalComplex, type RationalFunction } from '../closed-form/rational-function';

/**
 * One transfer path evaluated on the imaginary axis, as H(jω) = H0(jω)·e^(−jωτ): `at` gives H0,
 * `delay` is the pure delay τ in front of it, whose phase −ωτ is added exactly rather than
 * followed numerically. H0 may hold further delays (`innerDelay`, e.g. inside 1 + L(jω)); the
 * rational function equals H0 without any delay: as ω → 0 every delay tends to 1, so it alone
 * fixes where the phase starts, and its roots give the corner frequencies.
 */
export interface FrequencyChannel {
  at(w: number): Complex;
  rational: RationalFunction;
  /** The pure delay in front of the path, s. */
  delay: number;
  /** Delay inside H0, s; it bounds how fast H0's phase may turn. */
  innerDelay: number;
}

/** A channel that is exactly its rational function. */
export function rationalChannel(rational: RationalFunction): FrequencyChannel {
  return { at: (w) => evaluateRationalComplex(rational, { re: 0, im: w }), rational, delay: 0, innerDelay: 0 };
}

/** |root| of every non-zero pole and zero of the rational part, rad/s: where its asymptotes bend. */
export function cornerFrequencies(r: RationalFunction): number[] {
  const corners: number[] = [];
  for (const p of [r.num, r.den]) {
    const roots = polynomialRoots(p);
    if (!roots.ok) continue;
    for (const z of roots.roots) {
      const m = Math.hypot(z.re, z.im);
      if (m > 0 && Number.isFinite(m)) corners.push(m);
    }
  }
  return corners;
}
