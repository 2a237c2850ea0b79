import { MAX_SCRUB_HISTORY, type RunControlState, type RunEnded, type RunFrame, type RunSample } from '../../shared/protocol/run-events';
import type { RunKickRequest } from '../../shared/protocol/run-requests';
import type { InputTerm, Scenario } from '../../shared/scenario/scenario-schema';
import { createTwinRun, type TwinTrace } from '../../shared/twin/twin-run';
import type { Parsed } from '../../shared/validation/field-errors';
import { countUpTo, concatTrace, emptyTrace, sliceTrace, toFrame, TraceHistory } from './trace-buffer';

/** Wall time between frames, ms: smooth enough to watch, few enough messages to scale. */
export const FRAME_INTERVAL_MS = 30;
/** Simulated time one tick may advance at "as fast as possible", s; keeps each tick short. */
export const MAX_SIM_PER_FAST_TICK_S = 0.5;
/**
 * Longest stretch the twin integrates at once in a live run, s. A kick lands at the twin's own
 * time, so this bounds how far past the last frame a kick can land.
 */
export const LIVE_MAX_CHUNK_S = 0.05;
/**
 * Longest wall time one tick computes, ms. The twin returns at the first step boundary past it
 * and the run yields to the event loop before going on, so a stiff run never holds the server
 * (every other run, every request) for more than about this long.
 */
export const LIVE_SLICE_MS = 4;

export interface LiveRunOptions {
  speed: number;
  dt: number;
  /** ms; LIVE_SLICE_MS by default. null computes each tick to its target (only the bench's "before" figure). */
  sliceMs?: number | null;
}

export interface LiveRunSink {
  frame(frame: RunFrame): void;
  end(end: RunEnded): void;
}

export interface LiveRun {
  readonly runId: string;
  stop(): void;
  pause(): RunControlState;
  resume(): RunControlState;
  setSpeed(speed: number): RunControlState;
  /** Pauses and returns the recorded sample nearest to `time`, or field errors. */
  scrub(time: number): Parsed<RunSample>;
  /** Appends an impulse or step at the twin's current time. */
  kick(kick: RunKickRequest['kick']): Parsed<InputTerm>;
}

/**
 * Paces a twin run against the wall clock (speed × real time, or as fast as possible when
 * speed is 0) and hands its samples to the sink in batches. Every tick computes for at most
 * LIVE_SLICE_MS and then yields, so many runs share one event loop; a run over the twin's work
 * budget ends with reason "bound" and the twin's message.
 */
export function startLiveRun(runId: string, scenario: Scenario, options: LiveRunOptions, sink: LiveRunSink): LiveRun {
  const twin = createTwinRun(scenario, { dt: options.dt, maxChunk: Math.max(options.dt, LIVE_MAX_CHUNK_S) });
  const sliceMs = options.sliceMs === undefined ? LIVE_SLICE_MS : options.sliceMs;
  const now = () => performance.now();
  const history = new TraceHistory(MAX_SCRUB_HISTORY);
  let speed = options.speed;
  let paused = false;
  let finished = false;
  // Pacing: simulated time shown = paceStartSim + (now − paceStartWall) × speed.
  let paceStartWall = performance.now();
  let paceStartSim = 0;
  // The twin integrates in chunks and may run ahead of the wall clock; samples past the paced
  // time wait here so the stream never shows the future.
  let ahead: TwinTrace = emptyTrace();
  let shownTime = 0;
  let cancelPending: (() => void) | null = null;

  const schedule = (delayMs: number | null) => {
    if (delayMs === null) {
      const handle = setImmediate(tick);
      cancelPending = () => clearImmediate(handle);
    } else {
      const handle = setTimeout(tick, delayMs);
      cancelPending = () => clearTimeout(handle);
    }
  };

  const state = (): RunControlState => ({ runId, state: paused ? 'paused' : 'running', speed, simulatedTime: shownTime });

  const finish = (reason: RunEnded['reason'], message: string) => {
    if (finished) return;
    finished = true;
    cancelPending?.();
    sink.end({ runId, reason, message, simulatedTime: shownTime });
  };

  /** Emits the samples up to `target`; false when the slice ran out before the twin got there. */
  const emitUpTo = (target: number): boolean => {
    let caughtUp = true;
    if (ahead.t.length === 0 || ahead.t[ahead.t.length - 1]! < target) {
      const limits = sliceMs === null ? undefined : { deadline: now() + sliceMs, now };
      ahead = concatTrace(ahead, twin.advance(target, limits));
      caughtUp = twin.done || twin.time >= Math.min(target, twin.horizon) - 1e-12;
    }
    const cut = countUpTo(ahead, target);
    if (cut > 0) {
      const shown = sliceTrace(ahead, 0, cut);
      history.append(shown);
      sink.frame(toFrame(runId, shown));
      shownTime = shown.t[cut - 1]!;
    }
    ahead = sliceTrace(ahead, cut, ahead.t.length);
    return caughtUp;
  };

  function tick() {
    cancelPending = null;
    if (finished || paused) return;
    const target = speed > 0 ? paceStartSim + ((performance.now() - paceStartWall) / 1000) * speed : shownTime + MAX_SIM_PER_FAST_TICK_S;
    const caughtUp = emitUpTo(target);
    const drained = ahead.t.length === 0;
    if (twin.stop && drained) return finish('bound', twin.stop.message);
    if (twin.done && drained) return finish('finished', `Reached the horizon, t = ${shownTime.toFixed(3)} s.`);
    // Behind its target, the run goes on at once, but only after the event loop has had its turn.
    schedule(speed > 0 && caughtUp ? FRAME_INTERVAL_MS : null);
  }

  const restartPacing = () => {
    paceStartWall = performance.now();
    paceStartSim = shownTime;
  };

  schedule(null);

  return {
    runId,
    stop: () => finish('stopped', `Stopped at t = ${shownTime.toFixed(3)} s.`),
    pause() {
      if (!finished && !paused) {
        paused = true;
        cancelPending?.();
        cancelPending = null;
      }
      return state();
    },
    resume() {
      if (!finished && paused) {
        paused = false;
        restartPacing();
        schedule(null);
      }
      return state();
    },
    setSpeed(next: number) {
      restartPacing();
      speed = next;
      if (!finished && !paused) {
        cancelPending?.();
        schedule(null);
      }
      return state();
    },
    scrub(time: number) {
      if (time > shownTime + 1e-12) {
        return { ok: false, errors: [{ field: 'time', message: `t = ${time} s is not computed yet; the run has reached t = ${shownTime.toFixed(3)} s` }] };
      }
      const sample = history.nearest(time);
      if (!sample) return { ok: false, errors: [{ field: 'time', message: 'the run has no samples yet' }] };
      if (time < history.earliest - options.dt) {
        return { ok: false, errors: [{ field: 'time', message: `samples before t = ${history.earliest.toFixed(3)} s are no longer kept (at most ${MAX_SCRUB_HISTORY} samples)` }] };
      }
      if (!finished && !paused) {
        paused = true;
        cancelPending?.();
        cancelPending = null;
      }
      return { ok: true, value: sample };
    },
    kick(kick) {
      if (finished) return { ok: false, errors: [{ field: '', message: `the run has ended at t = ${shownTime.toFixed(3)} s; a kick needs a live run` }] };
      return twin.kick({ ...kick });
    },
  };
}
