import { performance } from 'node:perf_hooks';
import { evaluateUniformGrid, gridPointCount } from '../../shared/closed-form/index';
import type { Scenario } from '../../shared/scenario/scenario-schema';
import { type Parsed } from '../../shared/validation/field-errors';
import { type TimeMethod } from './cli-arguments';
import { solveByMethod } from './response-sources';

/** `kinetwin time`'s answer; the keys are part of the command's stable output. */
export interface TimeReport {
  method: TimeMethod;
  runs: number;
  median_ms: number;
  p10_ms: number;
  p90_ms: number;
  /** Grid points each run produced. */
  samples: number;
}

/** Untimed runs first, so the timings see compiled code and warm caches: a tenth of the runs, 5 to 50. */
export function warmUpRuns(runs: number): number {
  return Math.min(50, Math.max(5, Math.round(runs / 10)));
}

/** The value at fraction q of the sorted list, by linear interpolation between ranks (common practice). */
export function quantile(sorted: readonly number[], q: number): number {
  const pos = (sorted.length - 1) * q;
  const lo = Math.floor(pos);
  const hi = Math.ceil(pos);
  return sorted[lo]! + (sorted[hi]! - sorted[lo]!) * (pos - lo);
}

export type TimedWork = { ok: true; samples: number } | { ok: false; reason: string };

/**
 * One run of what `kinetwin response` computes for the method on the grid 0, dt, …, horizon:
 * closed form — solve (transfer functions, roots, partial fractions, theorems, metrics, LaTeX)
 * and evaluate angle and velocity on every grid point; sim — the twin run on that grid.
 */
export function responseWork(scenario: Scenario, method: TimeMethod, dt: number): Parsed<() => TimedWork> {
  const n = gridPointCount(scenario.horizon, dt);
  const angle = new Float64Array(n);
  const velocity = new Float64Array(n);
  const probe = solveByMethod(method, scenario, dt);
  if (!probe.ok) return probe;
  return {
    ok: true,
    value: () => {
      const solved = solveByMethod(method, scenario, dt);
      if (!solved.ok) return { ok: false, reason: 'the scenario stopped solving' };
      if (solved.value.closedForm) {
        evaluateUniformGrid(solved.value.closedForm.plan, dt, n, angle, velocity);
        return { ok: true, samples: n };
      }
      const twin = solved.value.twin!;
      if (twin.stop) return { ok: false, reason: `the twin stopped early at t = ${twin.stop.time.toFixed(4)} s: ${twin.stop.message}` };
      return { ok: true, samples: twin.samples.t.length };
    },
  };
}

/** Times `runs` runs of the work after warm-up, in this process, with `now` in ms. */
export function timeWork(work: () => TimedWork, method: TimeMethod, runs: number, now: () => number = () => performance.now()): { ok: true; report: TimeReport } | { ok: false; reason: string } {
  for (let i = 0; i < warmUpRuns(runs); i++) {
    const r = work();
    if (!r.ok) return r;
  }
  const times: number[] = [];
  let samples = 0;
  for (let i = 0; i < runs; i++) {
    const t0 = now();
    const r = work();
    times.push(now() - t0);
    if (!r.ok) return r;
    samples = r.samples;
  }
  times.sort((a, b) => a - b);
  const round = (x: number) => Math.round(x * 1e4) / 1e4;
  return { ok: true, report: { method, runs, median_ms: round(quantile(times, 0.5)), p10_ms: round(quantile(times, 0.1)), p90_ms: round(quantile(times, 0.9)), samples } };
}
