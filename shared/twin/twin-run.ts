import { resolveNonlinear } from '../scenario/nonlinear-schema';
import type { InputTerm, Scenario } from '../scenario/scenario-schema';
import { describeFieldErrors, type Parsed } from '../validation/field-errors';
import { hasWindupRegimes, integralRate, pidRequest, type ContinuousPidGains } from './continuous-pid';
import { firstPositive } from './event-bisection';
import { chooseSlip, frictionBoundMessage, frictionEvent } from './friction-regime';
import { forcingTermsOf, type ForcingTerms } from './forcing-terms';
import { driveTorque, gravityTorque, quantizeAngle } from './joint-effects';
import { admitKick } from './kick-rule';
import { boundMessage as runawayMessage, outOfBounds as runaway } from './run-bounds';
import { holdRequest, sampledPidStep, type SampledPidGains } from './sampled-pid';
import { gaussianSource } from './seeded-noise';
import { effectOnsets, type EffectOnset } from './effect-onsets';
import { TraceRecorder } from './trace-recorder';
import { createContinuousLoop } from './continuous-loop';
import { ANGLE, INTEGRAL, FILTER, VELOCITY, initialRunState } from './twin-run-state';
import { createTwinSolver, type DenseState, type StepObserver, type StretchResult, type TwinSolver } from './twin-solver';
import { twinScenarioErrors } from './twin-scenario-errors';
import { TWIN_DEFAULTS, type AdvanceLimits, type TwinOptions } from './twin-settings';
import type { KickTerm, TwinRun, TwinStop, TwinTrace } from './twin-types';
import { workAllowance, workMessage, type WorkSpent } from './work-budget';

// Callers import the twin's types from here; they live in their own files so each stays small.
export { TWIN_DEFAULTS, type AdvanceLimits, type TwinOptions, type TwinSettings } from './twin-settings';
export type { KickTerm, TwinRun, TwinSamples, TwinStop, TwinSwitches, TwinTrace, TwinWork } from './twin-types';
export { twinEffects, type EffectOnset, type TwinEffect } from './effect-onsets';

/** Why a stretch stopped before its end, if it did. */
type StretchHalt = 'bound' | 'event' | 'work' | 'deadline';

/** A stretch as integrated: the solver's result, the halt, and the event or halt time. */
interface IntegratedStretch {
  result: StretchResult;
  halt: StretchHalt | null;
  eventTime: number;
}

/** Most points at which one integrator step is scanned for a regime event. */
const MAX_EVENT_SCAN = 1000;


/**
 * Starts a twin run of the joint, its controller and the effects of its `nonlinear` block.
 * Integration restarts at every input discontinuity, controller sample and regime event, so
 * odex never steps across one; impulses and derivative kicks are applied as jumps of the velocity.
 * Throws a RangeError when the scenario fails twinScenarioErrors (parse with parseTwinScenario).
 * @example const run = createTwinRun(scenario); const s = run.advance(run.horizon);
 */
export function createTwinRun(scenario: Scenario, options: TwinOptions = {}): TwinRun {
  const invalid = twinScenarioErrors(scenario);
  if (invalid.length > 0) throw new RangeError(`scenario cannot run in the twin: ${describeFieldErrors(invalid)}`);
  const o = { ...TWIN_DEFAULTS, ...options };
  const nl = resolveNonlinear(scenario.nonlinear);
  const { joint, controller, horizon } = scenario;
  const closedLoop = controller.mode === 'pid';
  const sampled = closedLoop && controller.samplePeriod !== null;
  const continuousLoop = closedLoop && !sampled;
  const period = controller.samplePeriod ?? 0;
  const { kp, ki, kd, derivativeFilter: tf } = controller;
  const onError = controller.derivativeOn === 'error';
  const n = joint.gearRatio;
  const limit = nl.torqueLimit;
  const frictionOn = nl.staticFriction > 0;
  const shapesDrive = limit !== Infinity || nl.deadBand > 0;
  const dt = o.dt;
  // Grid times are k·dt; the tolerance keeps a horizon like 2.0 with dt 0.001 on the grid.
  const lastIndex = Math.floor(horizon / dt + 1e-9);
  const eps = 1e-9 * dt;
  // Sample instants and input edges closer than this are one stop (roundoff, e.g. 3·0.1 vs 0.3).
  const mergeEps = 1e-9 * Math.min(dt, sampled ? period : dt);
  const gridTime = (k: number) => k * dt;

  // The loop states are integrated only where they act: the integral with ki ≠ 0, the filter with
  // Tf > 0 (which keeps the integral slot too, the layout being fixed). Every state costs odex work.
  const stateSize = !continuousLoop ? 2 : tf > 0 ? 4 : ki !== 0 ? 3 : 2;
  const startForcing = forcingTermsOf(scenario);
  // Where the run stands (twin-run-state.ts); the fixed objects in it are also named here.
  const run = initialRunState(
    [scenario.initial.angle, scenario.initial.velocity, 0, -scenario.initial.angle].slice(0, stateSize),
    scenario.inputs.slice(),
    startForcing,
    startForcing.stretchFrom(0, mergeEps),
  );
  const { y, inputs, friction, pid, hold, onsets } = run;
  const work: WorkSpent = { evaluations: 0 };
  /** The work budget by simulated time t (see TWIN_DEFAULTS.workBase). */
  const allowance = (t: number) => workAllowance(o, t, run.nextIndex + run.nextSample);
  const overBudget = (t: number) => work.evaluations > allowance(t);

  // Sampled controller: its law's state and the hold of its request (sampled-pid.ts).
  const gains: SampledPidGains = {
    kp,
    ki,
    kd,
    derivativeFilter: tf,
    derivativeOnError: onError,
    period,
    gearRatio: n,
    torqueLimit: limit,
    antiWindup: nl.antiWindup,
  };
  // Continuous controller: its anti-windup regime, switched only at located events (continuous-pid.ts).
  const pidGains: ContinuousPidGains = {
    kp,
    ki,
    kd,
    derivativeFilter: tf,
    derivativeOnError: onError,
    gearRatio: n,
    torqueLimit: limit,
    antiWindup: nl.antiWindup,
  };
  const windupOn = continuousLoop && hasWindupRegimes(pidGains);
  /** Regime events are looked for on the dense output: stick/slip, and the anti-windup regime. */
  const eventsOn = frictionOn || windupOn;
  const noise = gaussianSource(nl.noiseSeed);

  // Each onset is kept the first time its effect acts (NaN until then) in named stores of
  // run.onsets: these checks run at every output sample and a keyed store measured slower.

  /** Drive torque asked for at the joint before limit and dead band, N·m. */
  const requestedTorque = (state: readonly number[], t: number): number => {
    if (!closedLoop) return run.stretch.torque(t);
    return sampled ? hold.held : loop.request(state, t);
  };

  /**
   * The request the drive acts on: the limit itself while the integrator slides on it (the
   * sliding motion's torque), which the computed request equals to integration accuracy.
   */
  const driveRequest = (state: readonly number[], t: number): number =>
    run.windup.mode === 'sliding' ? run.windup.side * limit : requestedTorque(state, t);

  /** Every torque on the joint except friction, N·m. */
  const netTorque = (state: readonly number[], t: number, requested: number): number =>
    driveTorque(requested, limit, nl.deadBand) +
    (closedLoop ? run.stretch.torque(t) : 0) -
    joint.damping * state[VELOCITY]! -
    joint.stiffness * state[ANGLE]! +
    gravityTorque(state[ANGLE]!, nl.gravityTorque, nl.gravityOffset);

  /** θ′ and θ″ under a drive request, in the friction regime as it stands, into `into`. */
  const jointRates = (state: readonly number[], t: number, requested: number, into: number[]) => {
    const net = netTorque(state, t, requested);
    if (frictionOn && friction.slip === 0) {
      into[ANGLE] = 0;
      into[VELOCITY] = 0;
    } else {
      into[ANGLE] = state[VELOCITY]!;
      into[VELOCITY] = (frictionOn ? net - friction.slip * nl.coulombFriction : net) / joint.inertia;
    }
  };

  // The continuous controller and its anti-windup regime (continuous-loop.ts).
  const loop = createContinuousLoop(pidGains, run, jointRates);

  /** The system's rates into `rates` (odex's own array while it integrates). */
  const rhsInto = (t: number, state: number[], rates: number[]): void => {
    work.evaluations++;
    const reference = continuousLoop ? run.stretch.reference(t) : 0;
    const requested = continuousLoop
      ? run.windup.mode === 'sliding'
        ? run.windup.side * limit
        : loop.request(state, t, reference)
      : requestedTorque(state, t);
    jointRates(state, t, requested, rates);
    if (stateSize > INTEGRAL) {
      const error = reference - state[ANGLE]!;
      // The regime is fixed over the stretch; it changes only at located events (continuous-pid.ts).
      const mode = run.windup.mode;
      rates[INTEGRAL] = mode === 'integrating' ? error : integralRate(run.windup, error, mode === 'sliding' ? loop.slidingRate(state, t, error, rates[ANGLE]!, rates[VELOCITY]!) : 0);
      if (stateSize > FILTER) rates[FILTER] = ((onError ? error : -state[ANGLE]!) - state[FILTER]!) / tf;
    }
  };
  const rates = new Array<number>(stateSize).fill(0);
  const rhs = (t: number, state: number[]): number[] => {
    rhsInto(t, state, rates);
    return rates;
  };

  /** The friction event at a state (friction-regime.ts); the net torque is needed only while held. */
  const stickSlipEvent = (state: readonly number[], t: number, drive = driveRequest(state, t)): number =>
    frictionEvent(friction.slip, state[VELOCITY]!, friction.slip === 0 ? netTorque(state, t, drive) : 0, nl.staticFriction);

  const chooseFrictionRegime = () => {
    friction.slip = chooseSlip(y[VELOCITY]!, y[VELOCITY] !== 0 ? 0 : netTorque(y, run.time, driveRequest(y, run.time)), nl.staticFriction);
  };

  /** Whether a regime must change at a state: the friction's or the integrator's (the request computed once for both). */
  const regimeEnds = (state: readonly number[], t: number): boolean => {
    if (!windupOn) return stickSlipEvent(state, t) > 0;
    const error = run.stretch.reference(t) - state[ANGLE]!;
    const requested = pidRequest(pidGains, error, state[INTEGRAL]!, loop.derivativeOf(state, t, error));
    if (frictionOn && stickSlipEvent(state, t, run.windup.mode === 'sliding' ? run.windup.side * limit : requested) > 0) return true;
    return loop.windupEvent(state, t, error, requested) > 0;
  };

  const applyJumpsAt = (t: number, terms: ForcingTerms) => {
    let dv = terms.torqueImpulseAt(t) / joint.inertia;
    // An unfiltered derivative of the error turns a reference jump into an impulse of torque;
    // a drive with a torque limit cannot deliver an impulse, so there it is lost.
    if (continuousLoop && onError && tf === 0 && limit === Infinity) dv += (n * kd * terms.referenceJumpAt(t)) / joint.inertia;
    y[VELOCITY]! += dv;
  };

  const takeSample = (t: number) => {
    const disturbance = nl.noiseStdDev > 0 ? nl.noiseStdDev * noise.next() : 0;
    const measured = quantizeAngle(y[ANGLE]! + disturbance, nl.encoderCounts);
    if (nl.noiseStdDev > 0 && Number.isNaN(onsets.noise)) onsets.noise = t;
    if (nl.encoderCounts > 0 && measured !== y[ANGLE]! + disturbance && Number.isNaN(onsets.quantization)) onsets.quantization = t;
    const request = sampledPidStep(pid, gains, run.stretch.reference(t), measured);
    holdRequest(hold, request, nl.computeDelay);
  };

  /** Brings the run to time t with y the left limit there: jumps, controller sample, friction regime. */
  const arriveAt = (t: number) => {
    run.time = t;
    // The left limit of a sliding stretch is on the limit: the drift since the last restart goes.
    if (windupOn && run.windup.mode === 'sliding') loop.holdOnLimit();
    const breakpoints = run.forcing.breakpoints;
    const passed = run.breakpointIndex;
    while (run.breakpointIndex < breakpoints.length && breakpoints[run.breakpointIndex]! <= t + mergeEps) {
      applyJumpsAt(breakpoints[run.breakpointIndex]!, run.forcing);
      run.breakpointIndex++;
    }
    if (run.breakpointIndex !== passed) run.stretch = run.forcing.stretchFrom(t, mergeEps);
    if (sampled && run.nextSample * period <= t + mergeEps) {
      takeSample(t);
      run.nextSample++;
    }
    if (frictionOn) chooseFrictionRegime();
    if (windupOn) loop.reviewRegime(run.breakpointIndex !== passed);
  };

  /** End of the next segment: the nearest input edge, sample instant, chunk end or horizon. */
  const nextStop = (): number => {
    const edge = run.breakpointIndex < run.forcing.breakpoints.length ? run.forcing.breakpoints[run.breakpointIndex]! : Infinity;
    const sample = sampled ? run.nextSample * period : Infinity;
    let end = Math.min(edge, sample, run.time + o.maxChunk, horizon);
    // An edge and a sample a roundoff apart become one stop at the later of the two, so the
    // controller sample there already sees the edge.
    if (edge > end && edge <= end + mergeEps) end = edge;
    if (sample > end && sample <= end + mergeEps) end = sample;
    return Math.min(end, horizon);
  };

  const outOfBounds = (state: readonly number[]) => runaway(o, state[ANGLE]!, state[VELOCITY]!);
  const boundMessage = (state: readonly number[], t: number) => runawayMessage(o, state[ANGLE]!, t);

  const solver = createTwinSolver(rhsInto, stateSize, o, true);
  const plainSolver = createTwinSolver(rhsInto, stateSize, o, false);

  const stepState = new Array<number>(stateSize).fill(0);
  const eventState = new Array<number>(stateSize).fill(0);

  /**
   * Whether a slide may have come to rest inside a stretch that started with acceleration
   * `startAcceleration`: the velocity left the slide's direction by the end, or the acceleration
   * turned (its sign at the ends differs), so the velocity may have dipped through zero and back.
   */
  const maySlideToRest = (startAcceleration: number, end: readonly number[], t: number) => {
    if (friction.slip * end[VELOCITY]! <= 0) return true;
    const endAcceleration = rhs(t, end as number[])[VELOCITY]!;
    return startAcceleration * endAcceleration <= 0;
  };

  const overBudgetMessage = (t: number) => workMessage(o, work.evaluations, t);

  function advance(until: number, limits?: AdvanceLimits): TwinTrace {
    const target = Math.min(until, horizon);
    const pastDeadline = limits ? () => limits.now() >= limits.deadline : () => false;
    // The last odex call may end up to one chunk past the target; its grid points are kept.
    const lastWanted = Math.min(lastIndex, Math.floor((target + o.maxChunk) / dt + 1e-9));
    const capacity = Math.max(0, lastWanted - run.nextIndex + 1);
    const recorder = new TraceRecorder(capacity);
    const emit = (t: number, state: readonly number[]) => {
      const requested = requestedTorque(state, t);
      const sliding = run.windup.mode === 'sliding';
      const drive = sliding ? run.windup.side * limit : requested;
      const applied = shapesDrive ? driveTorque(drive, limit, nl.deadBand) : requested;
      const saturating = sliding || Math.abs(requested) > limit;
      const sticking = frictionOn && friction.slip === 0;
      recorder.record(t, state[ANGLE]!, state[VELOCITY]!, closedLoop ? requested : 0, applied, saturating, sticking);
      if (saturating && Number.isNaN(onsets.torqueLimit)) onsets.torqueLimit = t;
      if (nl.deadBand > 0 && requested !== 0 && Number.isNaN(onsets.deadBand)) onsets.deadBand = t;
      if (frictionOn && !sticking && nl.coulombFriction > 0 && Number.isNaN(onsets.friction)) onsets.friction = t;
      if (sticking && netTorque(state, t, drive) !== 0 && Number.isNaN(onsets.stiction)) onsets.stiction = t;
      if (nl.gravityTorque !== 0 && gravityTorque(state[ANGLE]!, nl.gravityTorque, nl.gravityOffset) !== 0 && Number.isNaN(onsets.gravity)) onsets.gravity = t;
      run.nextIndex++;
    };
    const emitFromState = (upTo: number) => {
      while (run.nextIndex <= lastWanted && gridTime(run.nextIndex) <= upTo + eps) emit(gridTime(run.nextIndex), y);
    };

    // The stretch being integrated, shared with the step observer (made once per advance, not per stretch).
    let halt: StretchHalt | null = null;
    let eventTime = 0;
    let stretchEnd = 0;
    let stepDense: DenseState | null = null;
    // Stops at a step boundary keep the state there.
    const haltHere = (why: 'work' | 'deadline', x: number, state: readonly number[]) => {
      halt = why;
      eventTime = x;
      for (let c = 0; c < stateSize; c++) eventState[c] = state[c]!;
      return false;
    };
    const g = (t: number) => {
      work.evaluations++;
      for (let c = 0; c < stateSize; c++) eventState[c] = stepDense!(c, t);
      return regimeEnds(eventState, t) ? 1 : -1;
    };
    const observeStep: StepObserver = (xOld, x, state, dense) => {
      run.lastStep = x - xOld;
      if (outOfBounds(state)) {
        halt = 'bound';
        eventTime = x;
        return false;
      }
      if (!dense) {
        if (overBudget(x)) return haltHere('work', x, state);
        if (x < stretchEnd - eps && pastDeadline()) return haltHere('deadline', x, state);
        return;
      }
      stepDense = dense;
      let stepEnd = x;
      if (eventsOn) {
        // Scan the step at output spacing (at least 4 pieces, at most MAX_EVENT_SCAN): a long
        // step can carry the velocity through zero and back, which its end alone would not show.
        const span = x - xOld;
        const pieces = Math.min(MAX_EVENT_SCAN, Math.max(4, Math.ceil(span / dt)));
        let previous = xOld;
        for (let j = 1; j <= pieces; j++) {
          const tj = j === pieces ? x : xOld + (span * j) / pieces;
          if (g(tj) > 0) {
            eventTime = firstPositive(g, previous, tj);
            for (let c = 0; c < stateSize; c++) eventState[c] = dense(c, eventTime);
            halt = 'event';
            stepEnd = eventTime;
            break;
          }
          previous = tj;
        }
      }
      // Grid points inside the step; one landing on the segment's end is emitted after the
      // restart from the state there (after any jump), so the value at a breakpoint is its right limit.
      const lastInside = Math.min(stepEnd, stretchEnd) - eps;
      while (run.nextIndex <= lastWanted && gridTime(run.nextIndex) <= x && gridTime(run.nextIndex) < lastInside) {
        const tk = gridTime(run.nextIndex);
        for (let c = 0; c < stateSize; c++) stepState[c] = dense(c, tk);
        emit(tk, stepState);
      }
      if (halt === 'event') return false;
      if (overBudget(x)) return haltHere('work', x, state);
      if (x < stretchEnd - eps && pastDeadline()) return haltHere('deadline', x, state);
      return undefined;
    };

    /**
     * A stretch without grid points or events taken in one step when odex accepts it (a sample of
     * a sampled loop, once the steps have grown to the period), else null.
     */
    const wholeStretch = (start: number, end: number): IntegratedStretch | null => {
      const state = plainSolver.wholeStep(start, y, end);
      if (state === null) return null;
      const result: StretchResult = { outcome: 'converged', y: state, x: end, steps: 1 };
      if (outOfBounds(state)) return { result: { ...result, outcome: 'halted' }, halt: 'bound', eventTime: end };
      return { result, halt: null, eventTime: end };
    };

    /**
     * One integration over [start, end]: emits the grid points inside it and stops at a bound or at
     * the first regime event (found on the dense output, which `active` must provide for an event).
     */
    const integrateStretch = (active: TwinSolver, start: number, end: number): IntegratedStretch => {
      halt = null;
      eventTime = end;
      stretchEnd = end;
      // Start with the last accepted step: restarting from odex's default 1e-4 s at every chunk
      // costs more steps than the chunk itself needs.
      const result = active.stretch(start, y, end, Math.min(run.lastStep, end - start), Math.max(1, o.maxStepsPerChunk - (run.resumed?.steps ?? 0)), observeStep);
      return { result, halt: halt as StretchHalt | null, eventTime };
    };

    /** After arriving at the end of a stretch: false when a bound stopped the run there. */
    const settleArrival = (): boolean => {
      if (outOfBounds(y)) {
        stopAt(run.time, boundMessage(y, run.time));
        return false;
      }
      if (run.time >= horizon) {
        emitFromState(horizon);
        run.done = true;
      }
      return true;
    };

    if (!run.started) {
      run.started = true;
      arriveAt(0);
      if (outOfBounds(y)) stopAt(0, boundMessage(y, 0));
    }
    while (!run.done && run.nextIndex <= lastIndex) {
      emitFromState(run.time);
      if (run.time >= target) break;
      // A resumed stretch keeps its end (an edge added by a kick since may come first), so its
      // step bound covers one stretch however often a deadline cut it.
      const end = run.resumed ? Math.min(run.resumed.end, nextStop()) : nextStop();
      const segmentStart = run.time;
      if (frictionOn && friction.slip === 0 && !continuousLoop && run.stretch.torqueConstant) {
        // Stuck, with a held (or no) controller torque and a torque channel constant between its
        // edges: nothing on the joint changes before `end`, so the state stays put exactly.
        while (run.nextIndex <= lastWanted && gridTime(run.nextIndex) < end - eps) emit(gridTime(run.nextIndex), y);
        arriveAt(end);
        if (!settleArrival() || pastDeadline()) break;
        continue;
      }
      const gridInside = run.nextIndex <= lastWanted && gridTime(run.nextIndex) < end - eps;
      // Without grid points inside, the interpolant is needed only for a regime event, and a
      // slide can only end inside if the velocity reaches zero: try the cheaper solver first and
      // redo the stretch with dense output when the end state says the slide may have ended.
      // (A sampled loop restarts at every sample, so this is most of its stretches; a continuous
      // loop with anti-windup regimes has few stretches and always looks for its events.)
      const tryPlain = !gridInside && !windupOn && (!frictionOn || friction.slip !== 0);
      const startAcceleration = tryPlain && frictionOn ? rhs(segmentStart, y)[VELOCITY]! : 0;
      // odex's own start takes at most half a stretch, so steps of half its length say it is smooth there.
      let segment: IntegratedStretch | null = tryPlain && 2 * run.lastStep >= end - segmentStart ? wholeStretch(segmentStart, end) : null;
      segment ??= integrateStretch(tryPlain ? plainSolver : solver, segmentStart, end);
      // A plain stretch left at the deadline is checked like a finished one: the slide may have ended inside.
      const plainEnd = segment.halt === 'deadline' ? { y: eventState, t: segment.eventTime } : { y: segment.result.y, t: end };
      const plainDone = segment.halt === null ? segment.result.outcome === 'converged' : segment.halt === 'deadline';
      if (tryPlain && frictionOn && plainDone && maySlideToRest(startAcceleration, plainEnd.y, plainEnd.t)) {
        segment = integrateStretch(solver, segmentStart, end);
      }
      const { result, halt, eventTime } = segment;
      const stretchFrom = run.resumed?.from ?? segmentStart;
      if (halt === 'bound') {
        stopAt(result.x, boundMessage(result.y, result.x));
        break;
      }
      if (halt === 'work') {
        for (let c = 0; c < stateSize; c++) y[c] = eventState[c]!;
        stopAt(eventTime, overBudgetMessage(eventTime));
        break;
      }
      if (result.outcome === 'max-steps') {
        stopAt(
          stretchFrom,
          `integrator work bound: odex used its ${o.maxStepsPerChunk} steps between t = ${stretchFrom.toFixed(4)} s and ${end.toFixed(4)} s; the scenario is too stiff or fast for the twin at these tolerances`,
        );
        break;
      }
      if (halt === 'deadline') {
        // Left at a step boundary inside the stretch: no edge, sample or event lies before it,
        // so the run goes on from the state there without arriving anywhere.
        for (let c = 0; c < stateSize; c++) y[c] = eventState[c]!;
        run.resumed = { from: stretchFrom, steps: (run.resumed?.steps ?? 0) + result.steps, end };
        run.time = eventTime;
        break;
      }
      run.resumed = null;
      if (halt === 'event') {
        for (let c = 0; c < stateSize; c++) y[c] = eventState[c]!;
        // The same test the scan made at this state: a friction event, an integrator one, or both.
        const frictionSwitch = frictionOn && stickSlipEvent(y, eventTime) > 0;
        // A slide ends exactly at rest; the bisection leaves |v| at roundoff level past zero.
        if (frictionSwitch && friction.slip !== 0) y[VELOCITY] = 0;
        if (frictionSwitch && ++friction.events > o.maxFrictionEvents) {
          stopAt(eventTime, frictionBoundMessage(o.maxFrictionEvents, eventTime));
          break;
        }
        arriveAt(eventTime);
      } else {
        for (let c = 0; c < stateSize; c++) y[c] = result.y[c]!;
        arriveAt(end);
      }
      if (!settleArrival()) break;
      if (overBudget(run.time)) {
        stopAt(run.time, overBudgetMessage(run.time));
        break;
      }
      if (pastDeadline()) break;
    }
    if (run.nextIndex > lastIndex) run.done = true;
    return recorder.trace();
  }

  function stopAt(t: number, message: string) {
    run.stop = { reason: 'bound', time: t, message };
    run.time = t;
    run.done = true;
  }

  function kick(term: KickTerm): Parsed<InputTerm> {
    const admitted = admitKick(term, { done: run.done, time: run.time, horizon, closedLoop, termCount: inputs.length, mergeEps });
    if (!admitted.ok) return admitted;
    const added = admitted.value;
    inputs.push(added);
    run.forcing = forcingTermsOf({ ...scenario, inputs });
    if (run.started && added.delay === run.time) {
      // A stretch left at a deadline ends here: the kick starts a new one.
      run.resumed = null;
      if (windupOn && run.windup.mode === 'sliding') loop.holdOnLimit();
      run.stretch = run.forcing.stretchFrom(run.time, mergeEps);
      // Edges at `time` of the earlier terms were applied on arrival; only the new one's remains.
      applyJumpsAt(run.time, forcingTermsOf({ ...scenario, inputs: [added], recordedInputs: [] }));
      if (frictionOn) chooseFrictionRegime();
      if (windupOn) loop.reviewRegime(true);
      if (outOfBounds(y)) stopAt(run.time, boundMessage(y, run.time));
    }
    const edges = run.forcing.breakpoints;
    run.breakpointIndex = 0;
    while (run.breakpointIndex < edges.length && (run.started ? edges[run.breakpointIndex]! <= run.time : edges[run.breakpointIndex]! < 0)) run.breakpointIndex++;
    return { ok: true, value: added };
  }

  return {
    get time() {
      return run.time;
    },
    get done() {
      return run.done;
    },
    get stop() {
      return run.stop;
    },
    get inputs() {
      return inputs;
    },
    get effects() {
      return effectOnsets(onsets, scenario);
    },
    get work() {
      return { evaluations: work.evaluations, allowance: allowance(run.time) };
    },
    get switches() {
      return { friction: friction.events, integrator: run.windupSwitches };
    },
    horizon,
    dt,
    advance,
    kick,
  };
}


/**
 * Runs the twin over the whole horizon.
 * @example const { samples, stop, effects } = simulateTwin(scenario, { dt: 0.001 });
 */
export function simulateTwin(
  scenario: Scenario,
  options: TwinOptions = {},
): { samples: TwinTrace; stop: TwinStop | null; effects: readonly EffectOnset[] } {
  const run = createTwinRun(scenario, options);
  const samples = run.advance(scenario.horizon);
  return { samples, stop: run.stop, effects: run.effects };
}

export type { ForcingTerms };
