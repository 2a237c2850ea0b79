import { resolveNonlinear } from '../scenario/nonlinear-schema';
import type { InputTerm } from '../scenario/scenario-schema';
import { addTrackEdges, recordedTracks, seekTrack, trackConstant, trackJumpAt, trackRate, trackValue, type RecordedTrack } from './recorded-forcing';
import type { TwinScenario } from './recorded-samples';

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
   * as reached (the run merges stops a roundoff apart). With recorded inputs the stretch reads
   * their cursors, so it holds until the next call (the run keeps only the latest stretch);
   * calls must come in increasing `start`, or from a fresh ForcingTerms.
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
// `offset` is a constant that acts throughout (the torque offset of the nonlinear block).
function channelStretch(terms: readonly InputTerm[], offset = 0): ChannelStretch {
  let constant = offset;
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

/** Times at which a term starts or stops acting, every one of them (the horizon aside), sorted. */
function actingThresholds(inputs: readonly InputTerm[]): number[] {
  const times: number[] = [];
  for (const term of inputs) {
    times.push(term.delay);
    if (term.shape === 'pulse') times.push(term.delay + term.width!);
  }
  return times.sort((x, y) => x - y);
}

/** How many of the sorted `times` are at or before `t`. */
function countAtOrBefore(times: readonly number[], t: number): number {
  let n = 0;
  while (n < times.length && times[n]! <= t) n++;
  return n;
}

/**
 * Collects a scenario's forcing terms: its own input terms, the torque offset of its nonlinear
 * block, and the recorded inputs whose samples withRecordings attached.
 * @example forcingTermsOf(scenario).stretchFrom(0.5, 1e-12).reference(0.7) // rad
 */
export function forcingTermsOf(scenario: TwinScenario): ForcingTerms {
  const { inputs, horizon } = scenario;
  const offset = resolveNonlinear(scenario.nonlinear).torqueOffset;
  const tracks = recordedTracks(scenario);
  const edges = new Set<number>([0]);
  for (const term of inputs) {
    if (term.delay < horizon) edges.add(term.delay);
    if (term.shape === 'pulse' && term.delay + term.width! < horizon) edges.add(term.delay + term.width!);
  }
  for (const track of tracks) addTrackEdges(track, horizon, edges);

  // The acting set of the scenario's own terms changes only where start passes one of these, so
  // its stretch is built once per change, not at every recorded sample.
  const thresholds = actingThresholds(inputs);
  let built = -1;
  let reference = channelStretch([]);
  let torque = channelStretch([], offset);
  const rebuild = (start: number, eps: number) => {
    const reached = countAtOrBefore(thresholds, start + eps);
    if (reached === built) return;
    built = reached;
    const acting = inputs.filter((term) => actsFrom(term, start, eps));
    reference = channelStretch(acting.filter((term) => term.channel === 'reference'));
    torque = channelStretch(acting.filter((term) => term.channel === 'torque'), offset);
  };

  const referenceTracks: RecordedTrack[] = tracks.filter((track) => track.channel === 'reference');
  const torqueTracks: RecordedTrack[] = tracks.filter((track) => track.channel === 'torque');
  const sum = (list: readonly RecordedTrack[], t: number) => {
    let total = 0;
    for (let i = 0; i < list.length; i++) total += trackValue(list[i]!, t);
    return total;
  };
  const sumRates = (list: readonly RecordedTrack[]) => {
    let total = 0;
    for (let i = 0; i < list.length; i++) total += trackRate(list[i]!);
    return total;
  };
  /** With recorded inputs, one stretch object reading the cursors, updated in place. */
  const withTracks = {
    reference: (t: number) => reference.value(t) + sum(referenceTracks, t),
    referenceRate: (t: number) => reference.rate(t) + sumRates(referenceTracks),
    // Between samples a recorded set-point is constant or a straight line: no second derivative.
    referenceAcceleration: (t: number) => reference.acceleration(t),
    torque: (t: number) => torque.value(t) + sum(torqueTracks, t),
    torqueConstant: true,
  };

  return {
    breakpoints: [...edges].sort((x, y) => x - y),
    referenceJumpAt: (t) => {
      let total = 0;
      for (const term of inputs) if (term.channel === 'reference') total += termJumpAt(term, t);
      for (const track of referenceTracks) total += trackJumpAt(track, t);
      return total;
    },
    torqueImpulseAt: (t) => {
      let total = 0;
      for (const term of inputs) if (term.channel === 'torque' && term.shape === 'impulse' && term.delay === t) total += term.amplitude;
      return total;
    },
    stretchFrom: (start, eps) => {
      rebuild(start, eps);
      if (tracks.length === 0) {
        return { reference: reference.value, referenceRate: reference.rate, referenceAcceleration: reference.acceleration, torque: torque.value, torqueConstant: torque.constant };
      }
      let constant = torque.constant;
      for (const track of tracks) {
        seekTrack(track, start, eps);
        if (track.channel === 'torque') constant &&= trackConstant(track);
      }
      withTracks.torqueConstant = constant;
      return withTracks;
    },
  };
}
