import { type Scenario } from '../scenario/scenario-schema';
import { type InvertedPiece } from './inverse-response';
import { type TermSource } from './input-transforms';
import { transformPieces } from './input-transforms';
import { addDelayedResidues, emptyLaurent, removableAtZero } from './laurent-at-zero';
import { multiplyPolynomials, subtractPolynomials } from './polynomial';
import { formatPole, poleLocation } from './pole-location';
import { type PoleCluster } from './pole-clusters';
import { limitAtInfinity, type RationalFunction } from './rational-function';

/** The final value theorem's verdict on the angle: a value only when the theorem gives one. */
export interface FinalValue {
  applies: boolean;
  /** lim t→∞ θ(t) = lim s→0 sΘ(s), rad; null when the theorem does not apply. */
  value: number | null;
  /** Why the theorem does not apply (null when it does). */
  reason: string | null;
}

/** The initial value theorem at 0+, beside the state at 0−. */
export interface InitialValue {
  /** θ(0+) = lim s→∞ sΘ(s), rad (null when the theorem does not apply). */
  angle: number | null;
  /** θ'(0+) = lim s→∞ s(sΘ(s) − θ(0−)), rad/s (null when the theorem does not apply). */
  velocity: number | null;
  applies: boolean;
  reason: string | null;
  /** θ(0−), θ'(0−) from the scenario, so a jump (impulse, derivative kick) is visible. */
  before: { angle: number; velocity: number };
}

const S: number[] = [0, 1];

/**
 * Final value theorem for the angle: applies only when sΘ(s) is analytic on and right of the
 * imaginary axis (a standard condition of the theorem; e.g. Ogata, Modern Control Engineering,
 * from memory). Delays e^(−as) move no pole and equal 1 at s = 0, but delayed terms can cancel a
 * pole at s = 0 between them (a ramp minus a delayed ramp): that is decided on the summed
 * Laurent coefficients, so such a scenario gets its final value.
 * @example finalValue(pieces, loopPoles, scenario) // { applies: true, value: 0.5, reason: null }
 */
export function finalValue(pieces: readonly InvertedPiece[], loopPoles: readonly PoleCluster[], scenario: Scenario): FinalValue {
  const reasons: string[] = [];
  const loopProblems = loopPoles.filter((c) => c.center.im >= 0 && poleLocation(c.center) !== 'left' && !isOrigin(c.center));
  for (const c of loopProblems) {
    reasons.push(
      poleLocation(c.center) === 'right'
        ? `the loop is unstable: pole at ${formatPole(c.center)} in the right half-plane`
        : `the loop has undamped poles at ${formatPole(c.center)} on the imaginary axis`,
    );
  }
  const loopZeroOrder = loopPoles.find((c) => isOrigin(c.center))?.multiplicity ?? 0;
  const atZero = emptyLaurent();
  const growing: string[] = [];
  for (const piece of pieces) {
    const residues = residuesAtOrigin(piece);
    addDelayedResidues(atZero, residues, piece.delay);
    if (residues.slice(1).some((r) => r !== 0)) growing.push(`${describeSource(piece.source, scenario)} leaves a pole of sΘ(s) at s = 0: the angle grows without bound`);
    for (const c of piece.poles) {
      if (c.center.im <= 0 || poleLocation(c.center) === 'left') continue;
      const isLoopPole = loopProblems.some((l) => l.center.re === c.center.re && l.center.im === c.center.im);
      if (!isLoopPole) reasons.push(`${describeSource(piece.source, scenario)} puts poles of sΘ(s) at ${formatPole(c.center)} on the imaginary axis: the angle keeps oscillating`);
    }
  }
  if (!removableAtZero(atZero)) {
    if (loopZeroOrder >= 2) reasons.push('the joint is a double integrator (no stiffness, no damping, no loop): sΘ(s) keeps a pole at s = 0');
    else reasons.push(...growing);
  }
  const unique = [...new Set(reasons)];
  if (unique.length > 0) return { applies: false, value: null, reason: unique.join('; ') };
  return { applies: true, value: atZero.coefficients[0]!, reason: null };
}

/**
 * Final value of the reference signal r(t) by the same theorem (steps, ramps that cancel,
 * decays; a sine or cosine never settles). Open loop has no reference: r ≡ 0.
 * @example referenceFinalValue(scenario).value // 0.5 for a 0.5 rad step
 */
export function referenceFinalValue(scenario: Scenario): FinalValue {
  const atZero = emptyLaurent();
  const reasons: string[] = [];
  scenario.inputs.forEach((term, index) => {
    if (term.channel !== 'reference') return;
    for (const piece of transformPieces(term, index)) {
      if (piece.poles.some((p) => p.im !== 0)) {
        reasons.push(`${describeSource(piece.source, scenario)} keeps oscillating: the reference has no final value`);
        continue;
      }
      const order = piece.poles.filter(isOrigin).length;
      if (order === 0) continue; // a decay with λ > 0 dies out
      const residues = new Array<number>(order).fill(0);
      residues[order - 1] = piece.numerator[0] ?? 0;
      addDelayedResidues(atZero, residues, piece.delay);
    }
  });
  if (!removableAtZero(atZero)) reasons.push('the reference keeps ramping: it has no final value');
  if (reasons.length > 0) return { applies: false, value: null, reason: [...new Set(reasons)].join('; ') };
  return { applies: true, value: atZero.coefficients[0]!, reason: null };
}

/**
 * Steady-state error lim t→∞ (r(t) − θ(t)), rad, from the two final values; null unless both
 * the reference and the angle have one.
 * @example steadyStateErrorOf(finalValue(pieces, loopPoles, scenario), referenceFinalValue(scenario)) // 0 with integral action
 */
export function steadyStateErrorOf(angleFinal: FinalValue, referenceFinal: FinalValue): number | null {
  return angleFinal.applies && referenceFinal.applies ? referenceFinal.value! - angleFinal.value! : null;
}

function isOrigin(z: { re: number; im: number }): boolean {
  return z.re === 0 && z.im === 0;
}

/** r_j (coefficient of 1/s^j, j = 1 …) of a piece's transform at s = 0, from its time-domain mode there. */
function residuesAtOrigin(piece: InvertedPiece): number[] {
  const mode = piece.modes.find((m) => isOrigin(m.pole));
  if (!mode) return [];
  let factorial = 1;
  return mode.angle.map((c, j) => {
    if (j > 0) factorial *= j;
    return c.re * factorial;
  });
}

/**
 * Initial value theorem at 0+ over the pieces that act from t = 0 (delay 0) and the free
 * response. θ(0+) needs sΘ(s) bounded as s → ∞, θ'(0+) needs s(sΘ(s) − θ(0−)) bounded.
 * @example initialValue(pieces, scenario).velocity // derivative kick N·kd·A/J for a reference step
 */
export function initialValue(pieces: readonly InvertedPiece[], scenario: Scenario): InitialValue {
  const before = { angle: scenario.initial.angle, velocity: scenario.initial.velocity };
  let angle = 0;
  let velocity = 0;
  for (const piece of pieces) {
    if (piece.delay !== 0) continue;
    const F = piece.transform;
    const sF: RationalFunction = { num: multiplyPolynomials(S, F.num), den: F.den };
    const a = limitAtInfinity(sF);
    const velocityTransform: RationalFunction =
      piece.source.kind === 'initial' ? { num: subtractPolynomials(sF.num, multiplyPolynomials([before.angle], F.den)), den: F.den } : sF;
    const v = limitAtInfinity({ num: multiplyPolynomials(S, velocityTransform.num), den: velocityTransform.den });
    if (!a.finite || !v.finite) {
      const what = describeSource(piece.source, scenario);
      return { angle: null, velocity: null, applies: false, reason: `${what} makes sΘ(s) unbounded as s → ∞ (an impulse in the response)`, before };
    }
    angle += a.value;
    velocity += v.value;
  }
  // With no piece acting at 0+ the state simply carries over.
  if (!pieces.some((p) => p.delay === 0 && p.source.kind === 'initial')) {
    angle += before.angle;
    velocity += before.velocity;
  }
  return { angle, velocity, applies: true, reason: null, before };
}

/** "input 2 (sine on torque)" or "the initial state". */
export function describeSource(source: TermSource, scenario: Scenario): string {
  if (source.kind === 'initial') return 'the initial state';
  const term = scenario.inputs[source.index];
  const extra = term && (term.shape === 'sine' || term.shape === 'cosine') ? `, ω0 = ${term.frequency} rad/s` : '';
  return `input ${source.index} (${source.shape} on ${source.channel}${extra})`;
}
