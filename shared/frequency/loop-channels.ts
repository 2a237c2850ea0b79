import { addComplex, complex, divideComplex, expComplex, multiplyComplex, type Complex } from '../closed-form/complex-number';
import { jointTransfer } from '../closed-form/joint-transfer';
import { addPolynomials, multiplyPolynomials, scalePolynomial, trimPolynomial } from '../closed-form/polynomial';
import { cancelZeroRoots, evaluateRationalComplex, type RationalFunction } from '../closed-form/rational-function';
import { type Scenario } from '../scenario/scenario-schema';
import { rationalChannel, type FrequencyChannel } from './frequency-channel';

/** How a sampled controller's hold and compute delay enter the frequency response. */
export const SAMPLED_LOOP_MODEL =
  'sampled controller: its PID law taken as continuous, the zero-order hold as a delay of half a sample, e^(−sT/2) (an approximation, good well below the Nyquist frequency π/T), and the compute delay of one sample exactly, e^(−sT)';

/** The joint loop's transfer paths on the imaginary axis. */
export interface LoopChannels {
  /** L(jω): controller × gear × plant × loop delay, broken at the drive. Null in open loop. */
  loop: FrequencyChannel | null;
  /** Θ/R: closed-loop angle from the reference. Null in open loop. */
  referenceToAngle: FrequencyChannel | null;
  /** Θ/T: angle from an external torque at the joint (the plant alone in open loop). */
  torqueToAngle: FrequencyChannel;
  /** Total delay in the loop, s: the sampled controller's hold and compute delay; 0 for a continuous loop. */
  loopDelay: number;
  /** The rational loop without its delay (for its poles). Null in open loop. */
  loopRational: RationalFunction | null;
  /** Characteristic polynomial of the delay-free closed loop (or the plant in open loop). */
  characteristic: number[];
}

/**
 * The loop of the joint model, J θ'' + b θ' + k θ = N·u + τ, u the PID law
 * kp·e + ki∫e + kd·D with D the (optionally filtered, Tf) derivative of the error or of −θ:
 *   L(s) = N (kp s Ds + ki Ds + kd s²) / (s Ds G),  G = J s² + b s + k,  Ds = Tf s + 1
 * (the same P = s Ds G + N(…) as the closed form's jointTransfer). The reference path drops
 * kd s² when the derivative acts on the measurement. A sampled controller adds its delays.
 */
export function loopChannelsOf(scenario: Scenario): LoopChannels {
  const transfer = jointTransfer(scenario);
  const P = transfer.characteristic;
  const { inertia: J, damping: b, stiffness: k, gearRatio: N } = scenario.joint;
  const G = trimPolynomial([k, b, J]);
  const c = scenario.controller;
  const torqueRational = cancelZeroRoots({ num: transfer.angleFromTorque, den: P });
  if (c.mode === 'open-loop') {
    return { loop: null, referenceToAngle: null, torqueToAngle: rationalChannel(torqueRational), loopDelay: 0, loopRational: null, characteristic: P };
  }
  const Ds = transfer.filtered ? [1, c.derivativeFilter] : [1];
  const sDs = multiplyPolynomials([0, 1], Ds);
  const pi = addPolynomials(scalePolynomial(sDs, c.kp), scalePolynomial(Ds, c.ki));
  const den = multiplyPolynomials(sDs, G);
  const loopRational = cancelZeroRoots({ num: scalePolynomial(addPolynomials(pi, [0, 0, c.kd]), N), den });
  const pathRational = cancelZeroRoots({ num: scalePolynomial(addPolynomials(pi, [0, 0, c.derivativeOn === 'error' ? c.kd : 0]), N), den });
  const plant: RationalFunction = { num: [1], den: G };
  const referenceRational = cancelZeroRoots({ num: transfer.angleFromReference, den: P });
  const period = c.samplePeriod;
  if (period === null) {
    return {
      loop: rationalChannel(loopRational),
      referenceToAngle: rationalChannel(referenceRational),
      torqueToAngle: rationalChannel(torqueRational),
      loopDelay: 0,
      loopRational,
      characteristic: P,
    };
  }
  const loopDelay = period / 2 + (scenario.nonlinear?.computeDelay ? period : 0);
  const jw = (w: number): Complex => complex(0, w);
  const loopAt = (w: number) => multiplyComplex(evaluateRationalComplex(loopRational, jw(w)), expComplex(complex(0, -w * loopDelay)));
  const onePlusLoop = (w: number) => addComplex(complex(1), loopAt(w));
  return {
    loop: { at: (w) => evaluateRationalComplex(loopRational, jw(w)), rational: loopRational, delay: loopDelay, innerDelay: 0 },
    // Θ/R = Lr·e^(−sτ)/(1 + L·e^(−sτ)): the reference is sampled and held like the measurement.
    referenceToAngle: { at: (w) => divideComplex(evaluateRationalComplex(pathRational, jw(w)), onePlusLoop(w)), rational: referenceRational, delay: loopDelay, innerDelay: loopDelay },
    torqueToAngle: { at: (w) => divideComplex(evaluateRationalComplex(plant, jw(w)), onePlusLoop(w)), rational: torqueRational, delay: 0, innerDelay: loopDelay },
    loopDelay,
    loopRational,
    characteristic: P,
  };
}
