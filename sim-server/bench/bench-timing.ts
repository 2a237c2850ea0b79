import { performance } from 'node:perf_hooks';
import { setImmediate as yieldToLoop } from 'node:timers/promises';

/** The middle value (the mean of the two middle ones for an even count). */
export function median(values: readonly number[]): number {
  const sorted = values.slice().sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 ? sorted[mid]! : (sorted[mid - 1]! + sorted[mid]!) / 2;
}

/** Times fn once per run after warm-up; returns per-run milliseconds. */
export function timeRuns(fn: () => void, warmUp: number, runs: number): number[] {
  for (let i = 0; i < warmUp; i++) fn();
  const times: number[] = [];
  for (let i = 0; i < runs; i++) {
    const t0 = performance.now();
    fn();
    times.push(performance.now() - t0);
  }
  return times;
}

/**
 * Median wall time of `work`, ms, over `runs.timed` runs after `runs.warmUp` untimed ones
 * (JIT warm-up); yields to the event loop between runs so a long series starves nothing.
 */
export async function medianAfterWarmUp(work: () => unknown, runs: { warmUp: number; timed: number }): Promise<number> {
  for (let i = 0; i < runs.warmUp; i++) work();
  const times: number[] = [];
  for (let i = 0; i < runs.timed; i++) {
    const start = performance.now();
    work();
    times.push(performance.now() - start);
    await yieldToLoop();
  }
  return median(times);
}
