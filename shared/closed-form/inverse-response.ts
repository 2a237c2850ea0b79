import { type Scenario } from '../scenario/scenario-schema';
import { type FieldError, type Parsed } from '../validation/field-errors';
import { absComplex, type Complex } from './complex-number';
import { transformPieces, type TermSource } from './input-transforms';
import { jointTransfer, type JointTransfer } from './joint-transfer';
import { partialFractions } from './partial-fractions';
import { formatPole } from './pole-location';
import { clusterPoles, sharpenRepeatedRoots, type PoleCluster } from './pole-clusters';
import {
  divideByPowerOfS,
  leadingCoefficient,
  multiplyPolynomials,
  polynomialDegree,
  polynomialFromRoots,
  trimPolynomial,
  zeroRootCount,
} from './polynomial';
import { polynomialRoots } from './polynomial-roots';
import { type RationalFunction } from './rational-function';

/** Widest span of loop-pole magnitudes the engine accepts (decades): beyond it roundoff in the roots dominates. */
export const MAX_POLE_SPAN_DECADES = 12;
/** Largest response magnitude allowed anywhere up to the horizon; past it an unstable response would overflow. */
export const MAX_RESPONSE_MAGNITUDE = 1e200;

/**
 * One pole's share of a piece's time response: Σ_j angle[j]·t^j·e^(pole·t) (t from the piece's
 * delay). A pole with im > 0 stands for its conjugate pair and contributes 2·Re of the sum.
 */
export interface ResponseMode {
  pole: Complex;
  multiplicity: number;
  angle: Complex[];
  /** Coefficients of the derivative (t > delay), by the derivative rule. */
  velocity: Complex[];
}

/** The inverse transform of one delayed piece (one input edge, or the initial state). */
export interface InvertedPiece {
  source: TermSource;
  /** s. */
  delay: number;
  /** Θ of this piece without its e^(−as), zero roots cancelled exactly. */
  transform: RationalFunction;
  /** Every pole of the transform (conjugate-closed), repeated poles grouped. */
  poles: PoleCluster[];
  modes: ResponseMode[];
  /** angleImpulses[k] multiplies δ^(k)(t − delay): the improper part, never dropped. */
  angleImpulses: number[];
  /** velocityImpulses[k] multiplies δ^(k)(t − delay); [0] is the velocity impulse from a jump in angle. */
  velocityImpulses: number[];
}

export interface InvertedResponse {
  transfer: JointTransfer;
  /** Roots of the characteristic polynomial as found (conjugate-exact). */
  loopRoots: Complex[];
  /** The same roots grouped into repeated poles. */
  loopPoles: PoleCluster[];
  pieces: InvertedPiece[];
}

/**
 * Builds every piece's transform and inverts it by partial fractions: the "build and invert"
 * step of the closed form. Errors are values: an ill-conditioned loop or an overflowing
 * response comes back as field errors.
 * @example invertScenario(scenario) // { ok: true, value: { pieces: [...] } }
 */
export function invertScenario(scenario: Scenario): Parsed<InvertedResponse> {
  const transfer = jointTransfer(scenario);
  const loopField = scenario.controller.mode === 'pid' ? 'controller' : 'joint';
  const found = polynomialRoots(transfer.characteristic);
  if (!found.ok) return fail(loopField, `the loop's characteristic polynomial is ill-conditioned: ${found.reason}`);
  const loopRoots = sharpenRepeatedRoots(transfer.characteristic, found.roots);
  const spread = poleSpanDecades(loopRoots);
  if (spread > MAX_POLE_SPAN_DECADES) {
    const span = Number.isFinite(spread) ? spread.toFixed(1) : 'over 300';
    return fail(loopField, `the loop's poles span ${span} decades (more than ${MAX_POLE_SPAN_DECADES}); the closed form would be dominated by roundoff — rescale the joint or the gains`);
  }
  const P = transfer.characteristic;
  const lead = leadingCoefficient(P);
  const pieces: InvertedPiece[] = [];
  const freeAngle = invertPiece(transfer.freeAngle, P, lead, loopRoots, [], { kind: 'initial' }, 0, scenario.initial.angle);
  if (freeAngle) pieces.push(freeAngle);
  scenario.inputs.forEach((term, index) => {
    const channelNum = term.channel === 'reference' ? transfer.angleFromReference : transfer.angleFromTorque;
    for (const piece of transformPieces(term, index)) {
      const num = multiplyPolynomials(channelNum, piece.numerator);
      const inverted = invertPiece(num, P, lead, loopRoots, piece.poles, piece.source, piece.delay, 0);
      if (inverted) pieces.push(inverted);
    }
  });
  for (const piece of pieces) {
    const problem = checkPiece(piece, scenario.horizon);
    if (problem) return fail(problem.field, problem.message);
  }
  return { ok: true, value: { transfer, loopRoots, loopPoles: clusterPoles(loopRoots), pieces } };
}

function fail(field: string, message: string): { ok: false; errors: FieldError[] } {
  return { ok: false, errors: [{ field, message }] };
}

function poleSpanDecades(roots: readonly Complex[]): number {
  const mags = roots.map(absComplex).filter((m) => m > 0);
  if (mags.length < 2) return 0;
  return Math.log10(Math.max(...mags) / Math.min(...mags));
}

/**
 * Inverts num(s) / (P(s)·Π(s − inputPole)). `angleBefore` is θ(0−) for the free response, whose
 * velocity is sΘ − θ(0−) by the derivative rule; 0 for input pieces (they start from rest).
 */
function invertPiece(
  numerator: number[],
  P: readonly number[],
  lead: number,
  loopRoots: readonly Complex[],
  inputPoles: readonly Complex[],
  source: TermSource,
  delay: number,
  angleBefore: number,
): InvertedPiece | null {
  let num = trimPolynomial(numerator);
  if (polynomialDegree(num) < 0) return null;
  // Cancel exact zeros at s = 0 against exact poles there (an input's 1/s against a loop's s),
  // so the pole lists the theorems read hold no pole the function does not have.
  const loopZeroCount = loopRoots.filter(isExactZero).length;
  const inputZeroCount = inputPoles.filter(isExactZero).length;
  const cancel = Math.min(zeroRootCount(num), loopZeroCount + inputZeroCount);
  num = divideByPowerOfS(num, cancel);
  const fromInput = Math.min(cancel, inputZeroCount);
  const fromLoop = cancel - fromInput;
  const keptInput = dropZeros(inputPoles, fromInput);
  const keptLoop = dropZeros(loopRoots, fromLoop);
  const den = multiplyPolynomials(divideByPowerOfS(P, fromLoop), polynomialFromRoots(keptInput));
  const poles = clusterPoles(keptLoop, keptInput);
  const expansion = partialFractions(num, lead, poles);
  const modes: ResponseMode[] = [];
  for (const p of expansion.poles) {
    const angle = p.residues.map((r, j) => ({ re: r.re / factorial(j), im: r.im / factorial(j) }));
    if (angle.every((c) => c.re === 0 && c.im === 0)) continue;
    if (p.pole.im === 0) for (const c of angle) c.im = 0; // a real pole's residues are real; drop roundoff
    modes.push({ pole: p.pole, multiplicity: p.multiplicity, angle, velocity: derivativeCoefficients(p.pole, angle) });
  }
  const order = poles.reduce((s, c) => s + c.multiplicity, 0);
  const proper = expansion.properNumerator;
  // f(0+) of the regular part is lim s·F_proper(s): non-zero only at relative degree one.
  const startValue = polynomialDegree(proper) === order - 1 ? leadingCoefficient(proper) / lead : 0;
  let jump = startValue - angleBefore;
  // The free response starts at θ(0−) up to roundoff in the leading coefficients; a jump that
  // small is not an impulse.
  if (Math.abs(jump) <= 1e-12 * Math.max(Math.abs(startValue), Math.abs(angleBefore))) jump = 0;
  const angleImpulses = trimPolynomial(expansion.polynomialPart);
  const velocityImpulses = trimPolynomial([jump, ...angleImpulses]);
  return { source, delay, transform: { num, den }, poles, modes, angleImpulses, velocityImpulses };
}

function isExactZero(z: Complex): boolean {
  return z.re === 0 && z.im === 0;
}

function dropZeros(list: readonly Complex[], count: number): Complex[] {
  let left = count;
  return list.filter((z) => !(isExactZero(z) && left-- > 0));
}

function factorial(n: number): number {
  let f = 1;
  for (let k = 2; k <= n; k++) f *= k;
  return f;
}

/** d/dt Σ c_j t^j e^(pt) = Σ (p·c_j + (j+1)·c_(j+1)) t^j e^(pt). */
function derivativeCoefficients(p: Complex, c: readonly Complex[]): Complex[] {
  return c.map((cj, j) => {
    const next = c[j + 1] ?? { re: 0, im: 0 };
    return { re: p.re * cj.re - p.im * cj.im + (j + 1) * next.re, im: p.re * cj.im + p.im * cj.re + (j + 1) * next.im };
  });
}

/** Non-finite coefficients or a response that would overflow before the horizon. */
function checkPiece(piece: InvertedPiece, horizon: number): FieldError | null {
  const span = Math.max(horizon - piece.delay, 0);
  for (const mode of piece.modes) {
    for (let j = 0; j < mode.angle.length; j++) {
      const c = mode.angle[j]!;
      const v = mode.velocity[j]!;
      if (![c.re, c.im, v.re, v.im].every(Number.isFinite)) {
        return { field: fieldOf(piece.source), message: 'the partial-fraction residues are not finite (ill-conditioned transform)' };
      }
      const log = Math.log(Math.max(absComplex(c), absComplex(v), Number.MIN_VALUE)) + j * Math.log(Math.max(span, 1)) + Math.max(mode.pole.re, 0) * span;
      if (log > Math.log(MAX_RESPONSE_MAGNITUDE)) {
        return {
          field: 'horizon',
          message: `the response grows past ${MAX_RESPONSE_MAGNITUDE} before the horizon (pole at ${formatPole(mode.pole)}); shorten the horizon`,
        };
      }
    }
  }
  return null;
}

function fieldOf(source: TermSource): string {
  return source.kind === 'initial' ? 'initial' : `inputs.${source.index}`;
}
