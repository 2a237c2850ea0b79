import { type Scenario } from '../scenario/scenario-schema';
import { addPolynomials, divideByPowerOfS, multiplyPolynomials, scalePolynomial, trimPolynomial } from './polynomial';
import { type RationalFunction } from './rational-function';

/**
 * The joint loop in the Laplace domain, every channel over one characteristic polynomial P(s):
 * Θ(s) = [angleFromReference·R(s) + angleFromTorque·T(s) + freeResponse] / P(s).
 * Derived from J θ'' + b θ' + k θ = N·u_c + τ_ext with the PID law of the joint model
 * (kinetwin rules): with Ds = Tf·s + 1, G = J s² + b s + k and δ = 1 for derivative on error,
 *   P = s·Ds·(G + N kp) + N ki Ds + N kd s²
 *   angle ← R: N (kp s Ds + ki Ds + δ kd s²);  angle ← T: s Ds
 *   free response: s Ds (J s θ0 + J v0 + b θ0) + N kd s θ0   (derivative rule, xI(0−) = 0, D_f(0−) = 0)
 *   controller torque at the joint ← R: (angle ← R)·G;  ← T: −N (kp s Ds + ki Ds + kd s²)
 * Open loop: P = G, angle ← T: 1, free response J s θ0 + J v0 + b θ0, no controller torque.
 */
export interface JointTransfer {
  /** P(s), ascending coefficients. */
  characteristic: number[];
  angleFromReference: number[];
  angleFromTorque: number[];
  torqueFromReference: number[];
  torqueFromTorque: number[];
  /** Numerator of the free response to θ(0−), θ'(0−) (and the controller's initial states). */
  freeAngle: number[];
  /** Numerator of the controller torque's free response. */
  freeTorque: number[];
  /** Whether the derivative filter is in the loop (kd > 0 and Tf > 0). */
  filtered: boolean;
}

/**
 * Builds the joint's transfer numerators and characteristic polynomial from a validated scenario.
 * @example jointTransfer(scenario).characteristic // open loop J=1, b=2, k=5: [5, 2, 1]
 */
export function jointTransfer(scenario: Scenario): JointTransfer {
  const { inertia: J, damping: b, stiffness: k, gearRatio: N } = scenario.joint;
  const { angle: th0, velocity: v0 } = scenario.initial;
  const G = trimPolynomial([k, b, J]);
  const rest = trimPolynomial([J * v0 + b * th0, J * th0]);
  const c = scenario.controller;
  if (c.mode === 'open-loop') {
    return {
      characteristic: G,
      angleFromReference: [0],
      angleFromTorque: [1],
      torqueFromReference: [0],
      torqueFromTorque: [0],
      freeAngle: rest,
      freeTorque: [0],
      filtered: false,
    };
  }
  // Without a derivative gain the filter multiplies every channel and P alike: leave it out
  // rather than carry a pole that every numerator cancels.
  const filtered = c.kd > 0 && c.derivativeFilter > 0;
  const Ds = filtered ? [1, c.derivativeFilter] : [1];
  const sDs = multiplyPolynomials([0, 1], Ds);
  const delta = c.derivativeOn === 'error' ? 1 : 0;
  const pi = addPolynomials(scalePolynomial(sDs, c.kp), scalePolynomial(Ds, c.ki));
  const B = scalePolynomial(addPolynomials(pi, [0, 0, c.kd]), N);
  const A = scalePolynomial(addPolynomials(pi, [0, 0, delta * c.kd]), N);
  const P = addPolynomials(multiplyPolynomials(sDs, G), B);
  const freeAngle = addPolynomials(multiplyPolynomials(sDs, rest), [0, N * c.kd * th0]);
  const freeTorque = addPolynomials(scalePolynomial(multiplyPolynomials(B, rest), -1), multiplyPolynomials([0, N * c.kd * th0], G));
  const parts = {
    characteristic: P,
    angleFromReference: A,
    angleFromTorque: sDs,
    torqueFromReference: multiplyPolynomials(A, G),
    torqueFromTorque: scalePolynomial(B, -1),
    freeAngle,
    freeTorque,
  };
  if (c.ki !== 0) return { ...parts, filtered };
  // Without integral action every polynomial above has the exact factor s (its constant term is
  // an exact 0): divide it out so no spurious pole sits at the origin.
  const strip = (p: number[]) => divideByPowerOfS(p, 1);
  return {
    characteristic: strip(P),
    angleFromReference: strip(A),
    angleFromTorque: strip(sDs),
    torqueFromReference: strip(parts.torqueFromReference),
    torqueFromTorque: strip(parts.torqueFromTorque),
    freeAngle: strip(freeAngle),
    freeTorque: strip(freeTorque),
    filtered,
  };
}

/** The channel transfer functions as rationals (velocity = s·angle), for display and checks. */
export interface ChannelTransferFunctions {
  angle: RationalFunction;
  velocity: RationalFunction;
  controllerTorque: RationalFunction;
}

/** Transfer functions from the reference and torque channels to angle, velocity and controller torque. */
export function channelTransferFunctions(t: JointTransfer): { reference: ChannelTransferFunctions; torque: ChannelTransferFunctions } {
  const P = t.characteristic;
  const of = (angle: number[], torque: number[]): ChannelTransferFunctions => ({
    angle: { num: angle, den: P },
    velocity: { num: multiplyPolynomials([0, 1], angle), den: P },
    controllerTorque: { num: torque, den: P },
  });
  return { reference: of(t.angleFromReference, t.torqueFromReference), torque: of(t.angleFromTorque, t.torqueFromTorque) };
}
