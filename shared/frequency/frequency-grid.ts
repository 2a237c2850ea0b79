import type { Parsed } from '../validation/field-errors';

/** Lowest and highest angular frequency a response may be asked for, rad/s. */
export const MIN_FREQUENCY = 1e-6;
export const MAX_FREQUENCY = 1e9;
/** Most points of one frequency response; more would only slow the page and the file down. */
export const MAX_FREQUENCY_POINTS = 10_000;
/** The default grid: four decades around the frequencies joints are tuned at. */
export const DEFAULT_FREQUENCY_GRID = { from: 0.1, to: 1000, points: 200 } as const;

export interface FrequencyGridRequest {
  from: number;
  to: number;
  points: number;
}

/**
 * `points` angular frequencies from `from` to `to` rad/s, spaced evenly on a log axis (both ends
 * included, exactly), or field errors naming the bound.
 * @example logFrequencies({ from: 1, to: 100, points: 3 }) // { ok: true, value: [1, 10, 100] }
 */
export function logFrequencies({ from, to, points }: FrequencyGridRequest): Parsed<number[]> {
  const errors = [];
  const inRange = (x: number) => Number.isFinite(x) && x >= MIN_FREQUENCY && x <= MAX_FREQUENCY;
  if (!inRange(from)) errors.push({ field: 'from', message: `must be a frequency from ${MIN_FREQUENCY} to ${MAX_FREQUENCY} rad/s` });
  if (!inRange(to)) errors.push({ field: 'to', message: `must be a frequency from ${MIN_FREQUENCY} to ${MAX_FREQUENCY} rad/s` });
  if (errors.length === 0 && !(to > from)) errors.push({ field: 'to', message: 'must be above from' });
  if (!Number.isInteger(points) || points < 2 || points > MAX_FREQUENCY_POINTS) errors.push({ field: 'points', message: `must be a whole number from 2 to ${MAX_FREQUENCY_POINTS}` });
  if (errors.length > 0) return { ok: false, errors };
  const a = Math.log10(from);
  const step = (Math.log10(to) - a) / (points - 1);
  const value = Array.from({ length: points }, (_, i) => (i === 0 ? from : i === points - 1 ? to : 10 ** (a + i * step)));
  return { ok: true, value };
}
