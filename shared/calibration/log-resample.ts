/**
 * A log moved onto a uniform time grid by linear interpolation between neighbouring samples.
 * Only ever on request: interpolation smooths what was measured, so the report says it was done.
 */

/** Samples of a grid from `start` to at most `end` at `step`, computed from an index (no accumulated t += step). */
export function gridLength(start: number, end: number, step: number): number {
  // The small allowance keeps an end that is a whole number of steps away on the grid despite rounding.
  return Math.floor((end - start) / step + 1e-9) + 1;
}

/** Grid times start + i·step for i < n. */
export function uniformGrid(start: number, step: number, n: number): Float64Array {
  const grid = new Float64Array(n);
  for (let i = 0; i < n; i++) grid[i] = start + i * step;
  return grid;
}

/**
 * `values` (sampled at the strictly increasing `time`) at each grid time, which must lie within
 * [time[0], time[last]]. Written as a(1−w) + b·w so two finite values always give a finite one.
 */
export function interpolateLinear(time: Float64Array, values: Float64Array, grid: Float64Array): Float64Array {
  const out = new Float64Array(grid.length);
  let j = 0;
  const last = time.length - 1;
  for (let i = 0; i < grid.length; i++) {
    const t = grid[i]!;
    while (j < last - 1 && time[j + 1]! <= t) j++;
    const t0 = time[j]!;
    const t1 = time[Math.min(j + 1, last)]!;
    if (t1 === t0 || t <= t0) {
      out[i] = values[j]!;
      continue;
    }
    const w = Math.min(1, (t - t0) / (t1 - t0));
    out[i] = values[j]! * (1 - w) + values[Math.min(j + 1, last)]! * w;
  }
  return out;
}
