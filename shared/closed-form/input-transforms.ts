import { type InputChannel, type InputShape, type InputTerm } from '../scenario/scenario-schema';
import { type Complex } from './complex-number';

/** Where a response term came from: an input term of the scenario (by index) or the initial state. */
export type TermSource =
  | { kind: 'input'; index: number; channel: InputChannel; shape: InputShape; edge: 'start' | 'end' }
  | { kind: 'initial' };

/**
 * One delayed piece of an input: amplitude·numerator(s)/Π(s − pole)·e^(−delay·s). A pulse gives
 * two pieces (its rising and falling steps); every other shape gives one.
 */
export interface TransformPiece {
  source: TermSource & { kind: 'input' };
  /** s. */
  delay: number;
  /** Ascending coefficients, amplitude included. */
  numerator: number[];
  /** Exact poles, closed under conjugation; the denominator is monic. */
  poles: Complex[];
}

/**
 * Laplace transforms of the input shapes (Abramowitz & Stegun, Table 29.3, from memory):
 * δ → 1, u → 1/s, t·u → 1/s², sin ω0t → ω0/(s² + ω0²), cos ω0t → s/(s² + ω0²), e^(−λt) → 1/(s + λ),
 * each shifted by its delay (the time-shift rule, e^(−as)).
 * @example transformPieces({ channel: 'torque', shape: 'step', amplitude: 2, delay: 1 }, 0) // 2/s · e^(−s)
 */
export function transformPieces(term: InputTerm, index: number): TransformPiece[] {
  const A = term.amplitude;
  const a = term.delay;
  const w = term.frequency ?? 0;
  switch (term.shape) {
    case 'impulse':
      return [makePiece(term, index, 'start', a, [A], [])];
    case 'step':
      return [makePiece(term, index, 'start', a, [A], [ORIGIN])];
    case 'ramp':
      return [makePiece(term, index, 'start', a, [A], [ORIGIN, ORIGIN])];
    case 'pulse':
      return [makePiece(term, index, 'start', a, [A], [ORIGIN]), makePiece(term, index, 'end', a + (term.width ?? 0), [-A], [ORIGIN])];
    case 'sine':
      return [makePiece(term, index, 'start', a, [A * w], [{ re: 0, im: w }, { re: 0, im: -w }])];
    case 'cosine':
      return [makePiece(term, index, 'start', a, [0, A], [{ re: 0, im: w }, { re: 0, im: -w }])];
    case 'decay': {
      const rate = term.rate ?? 0;
      // −0 would make the pole look different from the step's exact 0 to an exact comparison.
      return [makePiece(term, index, 'start', a, [A], [{ re: rate === 0 ? 0 : -rate, im: 0 }])];
    }
  }
}

const ORIGIN: Complex = { re: 0, im: 0 };

function makePiece(term: InputTerm, index: number, edge: 'start' | 'end', delay: number, numerator: number[], poles: Complex[]): TransformPiece {
  return { source: { kind: 'input', index, channel: term.channel, shape: term.shape, edge }, delay, numerator, poles };
}
