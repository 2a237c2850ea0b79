import { type Complex } from './complex-number';
import { type TermSource } from './input-transforms';
import { type InvertedPiece } from './inverse-response';

interface TermBase {
  source: TermSource;
  /** The term acts from t = delay (s); it is multiplied by u(t − delay). */
  delay: number;
}

/**
 * One term of the closed form, in τ = t − delay:
 * exponential: coefficient·τ^power·e^(pole.re·τ);
 * oscillation (a conjugate pair pole.re ± j·pole.im): τ^power·e^(pole.re·τ)·(cos·cos(pole.im·τ) + sin·sin(pole.im·τ));
 * impulse: coefficient·δ^(order)(τ) (the improper part of a transform, kept explicit).
 */
export type ResponseTerm =
  | (TermBase & { kind: 'exponential'; pole: Complex; multiplicity: number; power: number; coefficient: number })
  | (TermBase & { kind: 'oscillation'; pole: Complex; multiplicity: number; power: number; cosCoefficient: number; sinCoefficient: number })
  | (TermBase & { kind: 'impulse'; order: number; coefficient: number });

/**
 * The structured terms of the angle (rad) or velocity (rad/s) closed form, one per pole power
 * per piece, exact zeros left out. Pairs are joined into real damped sinusoids:
 * 2·Re(c·e^(jωτ)) = 2c.re·cos ωτ − 2c.im·sin ωτ.
 * @example responseTerms(pieces, 'angle')[0] // { kind: 'exponential', pole: { re: -2, im: 0 }, power: 0, coefficient: 0.5, ... }
 */
export function responseTerms(pieces: readonly InvertedPiece[], which: 'angle' | 'velocity'): ResponseTerm[] {
  const terms: ResponseTerm[] = [];
  for (const piece of pieces) {
    const base = { source: piece.source, delay: piece.delay };
    for (const mode of piece.modes) {
      const coefs = which === 'angle' ? mode.angle : mode.velocity;
      coefs.forEach((c, power) => {
        if (mode.pole.im === 0) {
          if (c.re !== 0) terms.push({ ...base, kind: 'exponential', pole: mode.pole, multiplicity: mode.multiplicity, power, coefficient: c.re });
        } else if (c.re !== 0 || c.im !== 0) {
          terms.push({ ...base, kind: 'oscillation', pole: mode.pole, multiplicity: mode.multiplicity, power, cosCoefficient: 2 * c.re, sinCoefficient: -2 * c.im });
        }
      });
    }
    const impulses = which === 'angle' ? piece.angleImpulses : piece.velocityImpulses;
    impulses.forEach((coefficient, order) => {
      if (coefficient !== 0) terms.push({ ...base, kind: 'impulse', order, coefficient });
    });
  }
  return terms;
}
