import type { IntegratorRegime } from './continuous-pid';
import type { OnsetTimes } from './effect-onsets';
import type { ForcingStretch, ForcingTerms } from './forcing-terms';
import { initialFrictionState, type FrictionState } from './friction-regime';
import { initialSampledPidState, initialSampleHold, type SampledPidState, type SampleHold } from './sampled-pid';
import { noOnsets } from './effect-onsets';
import type { InputTerm } from '../scenario/scenario-schema';
import type { TwinStop } from './twin-types';

// State layout: angle, velocity, then for a continuous PID the integral of the error and the
// derivative-filter state. A sampled controller keeps its state outside the integrator.
export const ANGLE = 0;
export const VELOCITY = 1;
export const INTEGRAL = 2;
export const FILTER = 3;

/**
 * A stretch left at a step boundary when a deadline passed: where it began, the odex steps spent
 * on it and where it ends, so the per-stretch step bound means the same whether or not it was
 * interrupted.
 */
export interface ResumedStretch {
  from: number;
  steps: number;
  end: number;
}

/**
 * Where a twin run stands: everything that changes as it advances, in one object, so that the
 * files of the twin's parts (continuous-loop.ts, twin-run.ts) share one explicit state rather
 * than a closure's variables. The model (joint, gains, effects) does not change and is not here.
 */
export interface TwinRunState {
  /** The integrated states at `time`: angle, velocity, then the continuous PID's integral and filter. */
  readonly y: number[];
  /** s */
  time: number;
  started: boolean;
  done: boolean;
  stop: TwinStop | null;
  /** The next output grid index to record. */
  nextIndex: number;
  /** The next input breakpoint not yet reached. */
  breakpointIndex: number;
  /** The next controller sample (sampled loop). */
  nextSample: number;
  /** The last accepted odex step, s: the next stretch starts from it. */
  lastStep: number;
  resumed: ResumedStretch | null;
  /** The scenario's input terms, kicks appended. */
  readonly inputs: InputTerm[];
  forcing: ForcingTerms;
  /** The terms acting from the last breakpoint reached until the next; rebuilt at each breakpoint. */
  stretch: ForcingStretch;
  /** The continuous controller's anti-windup regime, switched only at located events. */
  windup: IntegratorRegime;
  windupSwitches: number;
  readonly friction: FrictionState;
  /** The sampled controller's law state and the hold of its request. */
  readonly pid: SampledPidState;
  readonly hold: SampleHold;
  /** Each effect's first action, NaN until then. */
  readonly onsets: OnsetTimes;
}

/** A run's state at t = 0, before the first arrival. */
export function initialRunState(y: number[], inputs: InputTerm[], forcing: ForcingTerms, stretch: ForcingStretch): TwinRunState {
  return {
    y,
    time: 0,
    started: false,
    done: false,
    stop: null,
    nextIndex: 0,
    breakpointIndex: 0,
    nextSample: 0,
    // odex's own first step; after that the last accepted one.
    lastStep: 1e-4,
    resumed: null,
    inputs,
    forcing,
    stretch,
    windup: { mode: 'integrating', side: 1 },
    windupSwitches: 0,
    friction: initialFrictionState(),
    pid: initialSampledPidState(),
    hold: initialSampleHold(),
    onsets: noOnsets(),
  };
}
