import type { InputTerm, Scenario } from '../scenario/scenario-schema';

/**
 * The scenario's forcing terms as the twin needs them: smooth values between discontinuities,
 * and the jumps that happen exactly at a term's start or end.
 */
export interface ForcingTerms {
  /** Times where some term starts or ends, ascending, unique, within (0, horizon) plus 0. */
  readonly breakpoints: readonly number[];
  /** Reference angle r(t), rad, right-continuous. */
  reference(t: number): number;
  /** dr/dt between jumps, rad/s (the jumps themselves are in referenceJumpAt). */
  referenceRate(t: number): number;
  /** External torque τ(t) at the joint without impulses, N·m, right-continuous. */
  torque(t: number): number;
  /** r(t+) − r(t−) at a breakpoint, rad. */
  referenceJumpAt(t: number): number;
  /** Sum of torque impulse areas at exactly t, N·m·s. */
  torqueImpulseAt(t: number): number;
}

/** Value of one term at t (impulses excluded), right-continuous at its edges. */
export function termValue(term: InputTerm, t: number): number {
  const s = t - term.delay;
  if (s < 0) return 0;
  const a = term.amplitude;
  switch (term.shape) {
    case 'impulse':
      return 0;
    case 'step':
      return a;
    case 'ramp':
      return a * s;
    case 'pulse':
      return s < term.width! ? a : 0;
    case 'sine':
      return a * Math.sin(term.frequency! * s);
    case 'cosine':
      return a * Math.cos(term.frequency! * s);
    case 'decay':
      return a * Math.exp(-term.rate! * s);
  }
}

/** Time derivative of one term between its jumps. */
export function termRate(term: InputTerm, t: number): number {
  const s = t - term.delay;
  if (s < 0) return 0;
  const a = term.amplitude;
  switch (term.shape) {
    case 'impulse':
    case 'step':
    case 'pulse':
      return 0;
    case 'ramp':
      return a;
    case 'sine':
      return a * term.frequency! * Math.cos(term.frequency! * s);
    case 'cosine':
      return -a * term.frequency! * Math.sin(term.frequency! * s);
    case 'decay':
      return -a * term.rate! * Math.exp(-term.rate! * s);
  }
}

/** Jump of one term's value at time t (0 when t is not one of its edges). */
export function termJumpAt(term: InputTerm, t: number): number {
  const a = term.amplitude;
  switch (term.shape) {
    case 'impulse':
    case 'ramp':
    case 'sine':
      return 0;
    case 'step':
    case 'cosine':
    case 'decay':
      return t === term.delay ? a : 0;
    case 'pulse':
      return (t === term.delay ? a : 0) - (t === term.delay + term.width! ? a : 0);
  }
}

/**
 * Collects a scenario's forcing terms by channel.
 * @example forcingTermsOf(scenario).reference(0.5) // rad
 */
export function forcingTermsOf(scenario: Scenario): ForcingTerms {
  const reference = scenario.inputs.filter((term) => term.channel === 'reference');
  const torque = scenario.inputs.filter((term) => term.channel === 'torque');
  const edges = new Set<number>([0]);
  for (const term of scenario.inputs) {
    if (term.delay < scenario.horizon) edges.add(term.delay);
    if (term.shape === 'pulse' && term.delay + term.width! < scenario.horizon) edges.add(term.delay + term.width!);
  }
  const sum = (terms: InputTerm[], f: (term: InputTerm, t: number) => number) => (t: number) => {
    let total = 0;
    for (const term of terms) total += f(term, t);
    return total;
  };
  return {
    breakpoints: [...edges].sort((x, y) => x - y),
    reference: sum(reference, termValue),
    referenceRate: sum(reference, termRate),
    torque: sum(torque, termValue),
    referenceJumpAt: sum(reference, termJumpAt),
    torqueImpulseAt: sum(torque, (term, t) => (term.shape === 'impulse' && term.delay === t ? term.amplitude : 0)),
  };
}
