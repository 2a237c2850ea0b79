/** What a twin run produces and how a caller drives it; createTwinRun (twin-run.ts) builds one. */
import type { InputTerm } from '../scenario/scenario-schema';
import type { Parsed } from '../validation/field-errors';
import type { EffectOnset } from './effect-onsets';
import type { AdvanceLimits } from './twin-settings';

/** The work a run has spent, and its allowance at the time reached, in right-hand-side and event-function evaluations. */
export interface TwinWork {
  evaluations: number;
  allowance: number;
}

/** Samples on the output grid; parallel arrays in time order. */
export interface TwinSamples {
  /** s */
  t: Float64Array;
  /** rad */
  angle: Float64Array;
  /** rad/s */
  velocity: Float64Array;
  /** Controller torque at the joint, N × motor torque, N·m (0 in open loop); the request before limit and dead band. */
  controllerTorque: Float64Array;
}

/**
 * What the twin produces: the samples plus the drive torque that reached the joint and the
 * per-sample flags. A TwinSamples, so code written for the plain samples keeps working.
 */
export interface TwinTrace extends TwinSamples {
  /**
   * Drive torque that reaches the joint after the torque limit and dead band, N·m. Closed loop: the
   * controller's; open loop: the torque channel's (impulses excluded). Disturbances on the torque
   * channel of a closed loop act on the joint directly and are not in here.
   */
  appliedTorque: Float64Array;
  /**
   * 1 where the drive request exceeds the torque limit, or holds on it while the anti-windup
   * integrator slides there (continuous-pid.ts).
   */
  saturating: Uint8Array;
  /** 1 where static friction holds the joint still. */
  sticking: Uint8Array;
}

/** Why a run stopped before its horizon. */
export interface TwinStop {
  reason: 'bound';
  /** Simulated time at which the bound was hit, s. */
  time: number;
  message: string;
}

/** Regime switches a run has made, each at a located event (README: the twin's friction and `antiWindup` text). */
export interface TwinSwitches {
  /** Stick/slip switches of the friction. */
  friction: number;
  /** Anti-windup integrator switches between integrating, frozen and sliding on the limit. */
  integrator: number;
}

/** A forcing term to add while a run is live; `delay` defaults to the run's current time. */
export type KickTerm = Omit<InputTerm, 'delay'> & { delay?: number };

/** A twin run that can be advanced piece by piece (for streaming) or all at once. */
export interface TwinRun {
  /** Simulated time reached so far, s. */
  readonly time: number;
  /** True once the horizon is reached or a bound stopped the run. */
  readonly done: boolean;
  /** Set when a bound stopped the run. */
  readonly stop: TwinStop | null;
  readonly horizon: number;
  readonly dt: number;
  /** The run's forcing terms, kicks included, in the order they were added. */
  readonly inputs: readonly InputTerm[];
  /** First action of each nonlinear effect so far, in time order. */
  readonly effects: readonly EffectOnset[];
  /** Work spent so far against the run's work budget. */
  readonly work: TwinWork;
  /** Regime switches so far. */
  readonly switches: TwinSwitches;
  /**
   * Integrates up to `until` (clamped to the horizon) and returns the new grid samples. With
   * `limits`, returns early at an integrator step boundary once the deadline has passed (after
   * at least one step, so every call makes progress); call again to go on from there.
   */
  advance(until: number, limits?: AdvanceLimits): TwinTrace;
  /**
   * Appends a forcing term starting at the current time (or later), for kicks. Returns the term as
   * added, which the closed form can take by superposition, or field errors.
   */
  kick(term: KickTerm): Parsed<InputTerm>;
}
