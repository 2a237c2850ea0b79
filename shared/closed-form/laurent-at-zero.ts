/**
 * Laurent coefficients at s = 0 of a sum of delayed terms Σ_i e^(−a_i s)·s·Y_i(s), built from each
 * term's residues at s = 0. Delays cannot move a pole, but they can cancel one between terms: a
 * ramp minus a delayed ramp gives s·Y = A·(e^(−a1 s) − e^(−a2 s))/s, whose pole at 0 is removable
 * (its value there is A·(a2 − a1)). Checking the summed coefficients decides that exactly.
 */
export interface LaurentAtZero {
  /** coefficients[k] multiplies s^(−k); [0] is the value at s = 0 when the rest vanish. */
  coefficients: number[];
  /** Sum of |contributions| per power, the scale for deciding that a coefficient cancelled to 0. */
  magnitudes: number[];
}

/** Relative size below which a summed Laurent coefficient is taken as cancelled (roundoff in the amplitudes). */
export const LAURENT_CANCEL_TOLERANCE = 1e-12;

export function emptyLaurent(): LaurentAtZero {
  return { coefficients: [0], magnitudes: [0] };
}

/**
 * Adds e^(−delay·s)·s·Y(s) where Y has residues[j−1] as the coefficient of 1/s^j at s = 0:
 * r_j/s^(j−1) · Σ_k (−a s)^k/k! contributes r_j(−a)^k/k! to s^(−(j−1−k)).
 * @example addDelayedResidues(acc, [0, 1], 0.2) // a unit ramp at 0.2 s: s^(−1) += 1, s^0 += −0.2
 */
export function addDelayedResidues(acc: LaurentAtZero, residues: readonly number[], delay: number): void {
  residues.forEach((r, index) => {
    const j = index + 1;
    let factor = 1;
    for (let k = 0; k <= j - 1; k++) {
      const n = j - 1 - k;
      while (acc.coefficients.length <= n) {
        acc.coefficients.push(0);
        acc.magnitudes.push(0);
      }
      const c = r * factor;
      acc.coefficients[n]! += c;
      acc.magnitudes[n]! += Math.abs(c);
      factor *= -delay / (k + 1);
    }
  });
}

/** True when every negative power cancelled: s·Y has no pole at s = 0. */
export function removableAtZero(acc: LaurentAtZero): boolean {
  for (let k = 1; k < acc.coefficients.length; k++) {
    if (Math.abs(acc.coefficients[k]!) > LAURENT_CANCEL_TOLERANCE * acc.magnitudes[k]!) return false;
  }
  return true;
}
