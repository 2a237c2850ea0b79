import type { LogTable } from './log-builder';
import { MEASURED_SIGNALS, type MeasuredSignal } from './log-signals';

/**
 * A log thinned for a plot: samples at `points` evenly spaced indices, the first and the last
 * always among them. Plain decimation, so a spike between two kept samples may not show; the
 * preview is for checking the mapping, not for reading peaks.
 */
export function thinnedSeries(table: LogTable, points: number): { time: number[]; values: Partial<Record<MeasuredSignal, number[]>> } {
  const n = table.time.length;
  const count = Math.max(2, Math.min(n, Math.floor(points)));
  const indices: number[] = [];
  for (let k = 0; k < count; k++) indices.push(n <= 1 ? 0 : Math.round((k * (n - 1)) / (count - 1)));
  const values: Partial<Record<MeasuredSignal, number[]>> = {};
  for (const signal of MEASURED_SIGNALS) {
    const column = table[signal];
    if (column) values[signal] = indices.map((i) => column[i]!);
  }
  return { time: indices.map((i) => table.time[i]!), values };
}
