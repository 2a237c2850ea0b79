import { type Complex } from './complex-number';
import { type ChannelTransferFunctions } from './joint-transfer';
import { type ResponsePlan } from './response-evaluator';
import { type ResponseTerm } from './response-terms';
import { type DominantPair } from './second-order-estimates';
import { type StepMetrics, type StepMetricsReport } from './step-metrics';
import { type FinalValue, type InitialValue } from './value-theorems';

/** A pole or zero with its multiplicity (s-plane, rad/s). */
export interface PoleSummary {
  re: number;
  im: number;
  multiplicity: number;
}

export type Stability = 'stable' | 'marginal' | 'unstable';

/** Everything the closed form says about one scenario, as plain data. */
export interface ClosedFormSolution {
  scenarioName: string;
  /** Caveats in words, e.g. that a sample period is ignored by the continuous closed form. */
  notes: string[];
  /** Poles of the joint loop (roots of the characteristic polynomial), conjugates listed. */
  poles: PoleSummary[];
  /** Zeros of angle/reference (null in open loop) and angle/torque. */
  zeros: { reference: PoleSummary[] | null; torque: PoleSummary[] };
  /** Angle per unit reference (rad/rad) and per unit torque (rad/(N·m)) at s = 0; null when infinite or absent. */
  dcGain: { reference: number | null; torque: number | null };
  stable: boolean;
  stability: Stability;
  /** Characteristic polynomial P(s), ascending coefficients. */
  characteristic: number[];
  transferFunctions: { reference: ChannelTransferFunctions | null; torque: ChannelTransferFunctions };
  /** Angle terms (rad) and velocity terms (rad/s). */
  terms: ResponseTerm[];
  velocityTerms: ResponseTerm[];
  latex: { angle: string; velocity: string };
  finalValue: FinalValue;
  initialValue: InitialValue;
  metrics: StepMetrics;
  metricsBasis: StepMetricsReport['basis'];
  /** Why metrics are null, when they are. */
  metricsReason: string | null;
  dominantPair: DominantPair | null;
  /** Compiled evaluator for angle and velocity on any grid. */
  plan: ResponsePlan;
}

/** A pole cluster as the plain {re, im, multiplicity} other tools read. */
export function poleSummary(center: Complex, multiplicity: number): PoleSummary {
  return { re: center.re, im: center.im, multiplicity };
}
