import { absComplex, type Complex } from './complex-number';

/**
 * Relative real-part margin inside which a computed pole counts as on the imaginary axis:
 * roundoff in the roots (≈1e-15·|p| for simple poles) cannot decide the sign of a smaller part.
 */
export const IMAGINARY_AXIS_TOLERANCE = 1e-9;

/** Left of, on, or right of the imaginary axis. */
export type PoleLocation = 'left' | 'axis' | 'right';

/** Which side of the imaginary axis a pole lies on. @example poleLocation({ re: -1e-20, im: 3 }) // 'axis' */
export function poleLocation(p: Complex): PoleLocation {
  if (p.re === 0) return 'axis';
  const margin = IMAGINARY_AXIS_TOLERANCE * absComplex(p);
  if (p.re < -margin) return 'left';
  return p.re > margin ? 'right' : 'axis';
}

/** A pole as text: "-2", "-1 ± 3j", "±3j". @example formatPole({ re: -1, im: 3 }) // "-1 ± 3j" */
export function formatPole(p: Complex, digits = 4): string {
  const re = Number(p.re.toPrecision(digits));
  const im = Number(Math.abs(p.im).toPrecision(digits));
  if (p.im === 0) return `${re}`;
  return re === 0 ? `±${im}j` : `${re} ± ${im}j`;
}
