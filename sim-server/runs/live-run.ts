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

  const finish = (reason: RunEnded['reason'], message: string) => {
    if (finished) return;
    finished = true;
    cancelPending?.();
    sink.end({ runId, reason, message, simulatedTime: twin.time });
  };

  const tick = () => {
    cancelPending = null;
    if (finished) return;
    const target =
      options.speed > 0 ? ((performance.now() - startedAt) / 1000) * options.speed : twin.time + MAX_SIM_PER_FAST_TICK_S;
    const samples = twin.advance(target);
    if (samples.t.length > 0) sink.frame(toFrame(runId, samples));
    if (twin.stop) return finish('bound', twin.stop.message);
    if (twin.done) return finish('finished', `Reached the horizon, t = ${twin.horizon.toFixed(3)} s.`);
    schedule(options.speed > 0 ? FRAME_INTERVAL_MS : null);
  };
  schedule(null);

  return {
    runId,
    stop: () => finish('stopped', `Stopped at t = ${twin.time.toFixed(3)} s.`),
  };
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
