import type { InputTerm, Scenario } from '../scenario/scenario-schema';

/**
 * The forcing terms acting on one stretch of a run, from a breakpoint up to (and including) the
 * next one. Each term that acts anywhere in the stretch acts on all of it, so a stretch that ends
 * where a step or pulse edge begins still sees the value from before the edge at its end point:
 * the integrator, which evaluates the right-hand side at the end of its last step, never sees the
 * jump it is not allowed to step across.
 */
export interface ForcingStretch {
  /** Reference angle r(t), rad. */
  reference(t: number): number;
  /** dr/dt, rad/s. */
  referenceRate(t: number): number;
  /** d²r/dt², rad/s² (the sliding integrator of an unfiltered derivative on error needs it). */
  referenceAcceleration(t: number): number;
  /** External torque τ(t) at the joint without impulses, N·m. */
  torque(t: number): number;
  /** True when the torque channel is constant over the stretch (steps and pulses only). */
  readonly torqueConstant: boolean;
}

/**
 * The scenario's forcing terms as the twin needs them: the breakpoints where a term starts or
 * ends, the jumps that happen exactly there, and the smooth values in between.
 */
export interface ForcingTerms {
  /** Times where some term starts or ends, ascending, unique, within (0, horizon) plus 0. */
  readonly breakpoints: readonly number[];
  /** r(t+) − r(t−) at a breakpoint, rad. */
  referenceJumpAt(t: number): number;
  /** Sum of torque impulse areas at exactly t, N·m·s. */
  torqueImpulseAt(t: number): number;
  /**
   * The terms acting from `start` until the next breakpoint. Edges within `eps` of `start` count
   * as reached (the run merges stops a roundoff apart).
   */
  stretchFrom(start: number, eps: number): ForcingStretch;
}

/** Value of an acting term `s` seconds after its start (impulses and edges are handled apart). */
function shapeValue(term: InputTerm, s: number): number {
  const a = term.amplitude;
  switch (term.shape) {
    case 'impulse':
      return 0;
    case 'step':
    case 'pulse':
      return a;
    case 'ramp':
      return a * s;
    case 'sine':
      return a * Math.sin(term.frequency! * s);
    case 'cosine':
      return a * Math.cos(term.frequency! * s);
    case 'decay':
      return a * Math.exp(-term.rate! * s);
  }
}

/** Time derivative of an acting term `s` seconds after its start. */
function shapeRate(term: InputTerm, s: number): number {
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

/** Second time derivative of an acting term `s` seconds after its start. */
function shapeAcceleration(term: InputTerm, s: number): number {
  const a = term.amplitude;
  switch (term.shape) {
    case 'impulse':
    case 'step':
    case 'pulse':
    case 'ramp':
      return 0;
    case 'sine':
      return -a * term.frequency! ** 2 * Math.sin(term.frequency! * s);
    case 'cosine':
      return -a * term.frequency! ** 2 * Math.cos(term.frequency! * s);
    case 'decay':
      return a * term.rate! ** 2 * Math.exp(-term.rate! * s);
  }
}

/** Jump of one term's value at time t (0 when t is not one of its edges). */
function termJumpAt(term: InputTerm, t: number): number {
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

/** Whether a term acts on the stretch that starts at `start`. */
function actsFrom(term: InputTerm, start: number, eps: number): boolean {
  if (term.delay > start + eps) return false;
  return term.shape !== 'pulse' || term.delay + term.width! > start + eps;
}

interface ChannelStretch {
  value: (t: number) => number;
  rate: (t: number) => number;
  acceleration: (t: number) => number;
  constant: boolean;
}

// Steps and pulses fold into one constant, so the common stretch (steps only) costs a return.
function channelStretch(terms: readonly InputTerm[]): ChannelStretch {
  let constant = 0;
  const varying: InputTerm[] = [];
  for (const term of terms) {
    if (term.shape === 'step' || term.shape === 'pulse') constant += term.amplitude;
    else if (term.shape !== 'impulse') varying.push(term);
  }
  if (varying.length === 0) return { value: () => constant, rate: () => 0, acceleration: () => 0, constant: true };
  return {
    value: (t) => {
      let total = constant;
      for (let i = 0; i < varying.length; i++) total += shapeValue(varying[i]!, t - varying[i]!.delay);
      return total;
    },
    rate: (t) => {
      let total = 0;
      for (let i = 0; i < varying.length; i++) total += shapeRate(varying[i]!, t - varying[i]!.delay);
      return total;
    },
    acceleration: (t) => {
      let total = 0;
      for (let i = 0; i < varying.length; i++) total += shapeAcceleration(varying[i]!, t - varying[i]!.delay);
      return total;
    },
    constant: false,
  };
}

/**
 * Collects a scenario's forcing terms.
 * @example forcingTermsOf(scenario).stretchFrom(0.5, 1e-12).reference(0.7) // rad
 */
export function forcingTermsOf(scenario: Scenario): ForcingTerms {
  const { inputs, horizon } = scenario;
  const edges = new Set<number>([0]);
  for (const term of inputs) {
    if (term.delay < horizon) edges.add(term.delay);
    if (term.shape === 'pulse' && term.delay + term.width! < horizon) edges.add(term.delay + term.width!);
  }
  return {
    breakpoints: [...edges].sort((x, y) => x - y),
    referenceJumpAt: (t) => {
      let total = 0;
      for (const term of inputs) if (term.channel === 'reference') total += termJumpAt(term, t);
      return total;
    },
    torqueImpulseAt: (t) => {
      let total = 0;
      for (const term of inputs) if (term.channel === 'torque' && term.shape === 'impulse' && term.delay === t) total += term.amplitude;
      return total;
    },
    stretchFrom: (start, eps) => {
      const acting = inputs.filter((term) => actsFrom(term, start, eps));
      const reference = channelStretch(acting.filter((term) => term.channel === 'reference'));
      const torque = channelStretch(acting.filter((term) => term.channel === 'torque'));
      return {
        reference: reference.value,
        referenceRate: reference.rate,
        referenceAcceleration: reference.acceleration,
        torque: torque.value,
        torqueConstant: torque.constant,
      };
    },
  };
}
