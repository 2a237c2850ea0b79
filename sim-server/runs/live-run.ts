import type { RunEnded, RunFrame } from '../../shared/protocol/run-events';
import type { Scenario } from '../../shared/scenario/scenario-schema';
import { createTwinRun, type TwinSamples } from '../../shared/twin/twin-run';

/** Wall time between frames, ms: smooth enough to watch, few enough messages to scale. */
export const FRAME_INTERVAL_MS = 30;
/** Simulated time one tick may advance at "as fast as possible", s; keeps each tick short. */
export const MAX_SIM_PER_FAST_TICK_S = 0.5;

export interface LiveRunOptions {
  speed: number;
  dt: number;
}

export interface LiveRunSink {
  frame(frame: RunFrame): void;
  end(end: RunEnded): void;
}

export interface LiveRun {
  readonly runId: string;
  stop(): void;
}

/**
 * Paces a twin run against the wall clock (speed × real time, or as fast as possible when
 * speed is 0) and hands its samples to the sink in batches. Every tick does a bounded amount of
 * work and then yields, so many runs share one event loop.
 */
export function startLiveRun(runId: string, scenario: Scenario, options: LiveRunOptions, sink: LiveRunSink): LiveRun {
  const twin = createTwinRun(scenario, { dt: options.dt });
  const startedAt = performance.now();
  let finished = false;
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

  // The twin integrates in whole chunks and may run ahead of the wall clock; samples past the
  // paced time wait here so the stream never shows the future.
  let ahead: TwinSamples | null = null;
  let shownTime = 0;

  const finish = (reason: RunEnded['reason'], message: string) => {
    if (finished) return;
    finished = true;
    cancelPending?.();
    sink.end({ runId, reason, message, simulatedTime: shownTime });
  };

  const emitUpTo = (target: number) => {
    if (!ahead) ahead = twin.advance(target);
    else if (ahead.t.length === 0 || ahead.t[ahead.t.length - 1]! < target) ahead = concat(ahead, twin.advance(target));
    let cut = 0;
    while (cut < ahead.t.length && ahead.t[cut]! <= target) cut++;
    if (cut > 0) {
      sink.frame(toFrame(runId, slice(ahead, 0, cut)));
      shownTime = ahead.t[cut - 1]!;
    }
    ahead = slice(ahead, cut, ahead.t.length);
  };

  const tick = () => {
    cancelPending = null;
    if (finished) return;
    const target =
      options.speed > 0 ? ((performance.now() - startedAt) / 1000) * options.speed : twin.time + MAX_SIM_PER_FAST_TICK_S;
    emitUpTo(target);
    const drained = ahead === null || (ahead as TwinSamples).t.length === 0;
    if (twin.stop && drained) return finish('bound', twin.stop.message);
    if (twin.done && drained) return finish('finished', `Reached the horizon, t = ${shownTime.toFixed(3)} s.`);
    schedule(options.speed > 0 ? FRAME_INTERVAL_MS : null);
  };
  schedule(null);

  return {
    runId,
    stop: () => finish('stopped', `Stopped at t = ${shownTime.toFixed(3)} s.`),
  };
}

function slice(s: TwinSamples, from: number, to: number): TwinSamples {
  return { t: s.t.subarray(from, to), angle: s.angle.subarray(from, to), velocity: s.velocity.subarray(from, to), controllerTorque: s.controllerTorque.subarray(from, to) };
}

function concat(a: TwinSamples, b: TwinSamples): TwinSamples {
  const join = (x: Float64Array, y: Float64Array) => {
    const out = new Float64Array(x.length + y.length);
    out.set(x);
    out.set(y, x.length);
    return out;
  };
  return { t: join(a.t, b.t), angle: join(a.angle, b.angle), velocity: join(a.velocity, b.velocity), controllerTorque: join(a.controllerTorque, b.controllerTorque) };
}

function toFrame(runId: string, s: TwinSamples): RunFrame {
  return {
    runId,
    t: Array.from(s.t),
    angle: Array.from(s.angle),
    velocity: Array.from(s.velocity),
    controllerTorque: Array.from(s.controllerTorque),
  };
}
