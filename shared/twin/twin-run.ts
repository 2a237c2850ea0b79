import { Outcome, Solver } from 'odex';
import type { Scenario } from '../scenario/scenario-schema';
import { forcingTermsOf, type ForcingTerms } from './forcing-terms';

/** Defaults of a twin run; the README's configuration table quotes these. */
export const TWIN_DEFAULTS: TwinSettings = {
  /** Output sample spacing, s. */
  dt: 0.001,
  /** odex relative and absolute tolerances. */
  relativeTolerance: 1e-10,
  absoluteTolerance: 1e-10,
  /** Longest stretch integrated in one odex call, s; also the streaming granularity. */
  maxChunk: 0.25,
  /** A run stops when |angle| exceeds this, rad (a runaway joint, not a real move). */
  angleBound: 1e6,
  /** A run stops when |velocity| exceeds this, rad/s. */
  velocityBound: 1e7,
  /** odex step budget per chunk; exhausting it means the scenario is too stiff for this integrator. */
  maxStepsPerChunk: 20000,
};

export interface TwinSettings {
  dt: number;
  relativeTolerance: number;
  absoluteTolerance: number;
  maxChunk: number;
  angleBound: number;
  velocityBound: number;
  maxStepsPerChunk: number;
}

export type TwinOptions = Partial<TwinSettings>;

/** Samples on the output grid; parallel arrays in time order. */
export interface TwinSamples {
  /** s */
  t: Float64Array;
  /** rad */
  angle: Float64Array;
  /** rad/s */
  velocity: Float64Array;
  /** Controller torque at the joint, N × motor torque, N·m (0 in open loop). */
  controllerTorque: Float64Array;
}

/** Why a run stopped before its horizon. */
export interface TwinStop {
  reason: 'bound';
  /** Simulated time at which the bound was hit, s. */
  time: number;
  message: string;
}

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
  /** Integrates up to `until` (clamped to the horizon) and returns the new grid samples. */
  advance(until: number): TwinSamples;
}

// State layout: angle, velocity, integrator of the error, derivative-filter state.
const ANGLE = 0;
const VELOCITY = 1;
const INTEGRAL = 2;
const FILTER = 3;

/**
 * Starts a twin run of the linear joint with its continuous PID loop.
 * Integration restarts at every input discontinuity, so odex never steps across one; impulses
 * and derivative kicks are applied as jumps of the velocity.
 * @example const run = createTwinRun(scenario); const s = run.advance(run.horizon);
 */
export function createTwinRun(scenario: Scenario, options: TwinOptions = {}): TwinRun {
  const o = { ...TWIN_DEFAULTS, ...options };
  const { joint, controller, horizon } = scenario;
  const forcing = forcingTermsOf(scenario);
  const closedLoop = controller.mode === 'pid';
  const { kp, ki, kd, derivativeFilter: tf } = controller;
  const onError = controller.derivativeOn === 'error';
  const n = joint.gearRatio;
  const dt = o.dt;
  // Grid times are k·dt; the tolerance keeps a horizon like 2.0 with dt 0.001 on the grid.
  const lastIndex = Math.floor(horizon / dt + 1e-9);
  const eps = 1e-9 * dt;
  const gridTime = (k: number) => k * dt;

  const y = [scenario.initial.angle, scenario.initial.velocity, 0, -scenario.initial.angle];
  let time = 0;
  let nextIndex = 0;
  let breakpointIndex = 0;
  let stop: TwinStop | null = null;
  let done = false;

  const derivativeSignal = (state: readonly number[], t: number) => (onError ? forcing.reference(t) - state[ANGLE]! : -state[ANGLE]!);

  const controllerTorque = (state: readonly number[], t: number): number => {
    if (!closedLoop) return 0;
    const error = forcing.reference(t) - state[ANGLE]!;
    let derivative: number;
    if (tf > 0) derivative = (derivativeSignal(state, t) - state[FILTER]!) / tf;
    else derivative = onError ? forcing.referenceRate(t) - state[VELOCITY]! : -state[VELOCITY]!;
    return n * (kp * error + ki * state[INTEGRAL]! + kd * derivative);
  };

  const rhs = (t: number, state: number[]): number[] => {
    const torque = controllerTorque(state, t) + forcing.torque(t);
    const acceleration = (torque - joint.damping * state[VELOCITY]! - joint.stiffness * state[ANGLE]!) / joint.inertia;
    const integralRate = closedLoop ? forcing.reference(t) - state[ANGLE]! : 0;
    const filterRate = closedLoop && tf > 0 ? (derivativeSignal(state, t) - state[FILTER]!) / tf : 0;
    return [state[VELOCITY]!, acceleration, integralRate, filterRate];
  };

  const applyJumpsAt = (t: number) => {
    let dv = forcing.torqueImpulseAt(t) / joint.inertia;
    // An unfiltered derivative of the error turns a reference jump into an impulse of torque.
    if (closedLoop && onError && tf === 0) dv += (n * kd * forcing.referenceJumpAt(t)) / joint.inertia;
    y[VELOCITY]! += dv;
  };

  const outOfBounds = (state: readonly number[]) =>
    !Number.isFinite(state[ANGLE]!) ||
    !Number.isFinite(state[VELOCITY]!) ||
    Math.abs(state[ANGLE]!) > o.angleBound ||
    Math.abs(state[VELOCITY]!) > o.velocityBound;

  const boundMessage = (state: readonly number[], t: number) =>
    Math.abs(state[ANGLE]!) > o.angleBound || !Number.isFinite(state[ANGLE]!)
      ? `angle left ±${o.angleBound} rad at t = ${t.toFixed(4)} s: the scenario runs away (unstable loop or unbounded forcing)`
      : `velocity left ±${o.velocityBound} rad/s at t = ${t.toFixed(4)} s: the scenario runs away (unstable loop or unbounded forcing)`;

  const solver = new Solver(4);
  solver.denseOutput = true;
  solver.relativeTolerance = o.relativeTolerance;
  solver.absoluteTolerance = o.absoluteTolerance;
  solver.maxSteps = o.maxStepsPerChunk;

  function advance(until: number): TwinSamples {
    const target = Math.min(until, horizon);
    // The last odex call may end up to one chunk past the target; its grid points are kept.
    const lastWanted = Math.min(lastIndex, Math.floor((target + o.maxChunk) / dt + 1e-9));
    const capacity = Math.max(0, lastWanted - nextIndex + 1);
    const out: TwinSamples = {
      t: new Float64Array(capacity),
      angle: new Float64Array(capacity),
      velocity: new Float64Array(capacity),
      controllerTorque: new Float64Array(capacity),
    };
    let count = 0;
    const emit = (t: number, state: readonly number[]) => {
      out.t[count] = t;
      out.angle[count] = state[ANGLE]!;
      out.velocity[count] = state[VELOCITY]!;
      out.controllerTorque[count] = controllerTorque(state, t);
      count++;
      nextIndex++;
    };
    const emitFromState = (upTo: number) => {
      while (nextIndex <= lastWanted && gridTime(nextIndex) <= upTo + eps) emit(gridTime(nextIndex), y);
    };

    while (!done && (time < target || count === 0) && nextIndex <= lastIndex) {
      const breakpoints = forcing.breakpoints;
      if (breakpointIndex < breakpoints.length && breakpoints[breakpointIndex]! <= time) {
        applyJumpsAt(breakpoints[breakpointIndex]!);
        breakpointIndex++;
        if (outOfBounds(y)) {
          stopAt(time, boundMessage(y, time));
          break;
        }
      }
      emitFromState(time);
      if (time >= target) break;
      const nextBreak = breakpointIndex < breakpoints.length ? breakpoints[breakpointIndex]! : horizon;
      const end = Math.min(nextBreak, time + o.maxChunk, horizon);
      const segmentStart = time;
      const stepState = [0, 0, 0, 0];
      const result = solver.solve(rhs, segmentStart, y.slice(), end, (step, _xOld, x, state, dense) => {
        if (step === 1 || !dense) return;
        if (outOfBounds(state)) return false;
        // Grid points inside the step; one landing on `end` is emitted after the loop from the
        // final state (and after any jump there), so the value at a breakpoint is its right limit.
        while (nextIndex <= lastWanted && gridTime(nextIndex) <= x && gridTime(nextIndex) < end - eps) {
          const tk = gridTime(nextIndex);
          for (let c = 0; c < 4; c++) stepState[c] = dense(c, tk);
          emit(tk, stepState);
        }
        return;
      });
      if (result.outcome === Outcome.EarlyReturn) {
        stopAt(result.xEnd, boundMessage(result.y, result.xEnd));
        break;
      }
      if (result.outcome === Outcome.MaxStepsExceeded) {
        stopAt(
          segmentStart,
          `integrator work bound: odex used its ${o.maxStepsPerChunk} steps between t = ${segmentStart.toFixed(4)} s and ${end.toFixed(4)} s; the scenario is too stiff or fast for the twin at these tolerances`,
        );
        break;
      }
      for (let c = 0; c < 4; c++) y[c] = result.y[c]!;
      time = end;
      if (outOfBounds(y)) {
        stopAt(time, boundMessage(y, time));
        break;
      }
      if (time >= horizon) {
        emitFromState(horizon);
        done = true;
      }
    }
    if (nextIndex > lastIndex) done = true;
    return {
      t: out.t.subarray(0, count),
      angle: out.angle.subarray(0, count),
      velocity: out.velocity.subarray(0, count),
      controllerTorque: out.controllerTorque.subarray(0, count),
    };
  }

  function stopAt(t: number, message: string) {
    stop = { reason: 'bound', time: t, message };
    time = t;
    done = true;
  }

  return {
    get time() {
      return time;
    },
    get done() {
      return done;
    },
    get stop() {
      return stop;
    },
    horizon,
    dt,
    advance,
  };
}

/**
 * Runs the twin over the whole horizon.
 * @example const { samples, stop } = simulateTwin(scenario, { dt: 0.001 });
 */
export function simulateTwin(scenario: Scenario, options: TwinOptions = {}): { samples: TwinSamples; stop: TwinStop | null } {
  const run = createTwinRun(scenario, options);
  const samples = run.advance(scenario.horizon);
  return { samples, stop: run.stop };
}

export type { ForcingTerms };
