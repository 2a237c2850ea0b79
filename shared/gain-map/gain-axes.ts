import { PARAMETER_CATALOGUE, parameterName, rangeViolation, type CatalogueEntry } from '../scenario/parameter-catalogue';

/** Most points along one axis of a gain map (a map is at most 200 × 200 cells). */
export const MAX_AXIS_POINTS = 200;
/** Fewest points along an axis: a map needs two values to span a range. */
export const MIN_AXIS_POINTS = 2;

export const AXIS_SPACINGS = ['linear', 'log'] as const;
export type AxisSpacing = (typeof AXIS_SPACINGS)[number];

/**
 * The parameters a map may sweep or fix: the controller's parameters the tuning form edits (kp,
 * ki, kd, derivativeFilter), by their short names. Taken from the catalogue, so a parameter made
 * editable there becomes sweepable here.
 */
export const MAP_GAIN_ENTRIES: readonly CatalogueEntry[] = PARAMETER_CATALOGUE.filter((e) => e.group === 'controller' && e.editable);
export const MAP_GAINS: readonly string[] = MAP_GAIN_ENTRIES.map(parameterName);

/** One swept axis, with its values as plain numbers (serialisable). */
export interface GainAxis {
  /** Short name, e.g. "kp". */
  gain: string;
  /** Scenario path, e.g. "controller.kp". */
  path: string;
  symbol: string;
  label: string;
  unit: string;
  spacing: AxisSpacing;
  min: number;
  max: number;
  /** min … max, ascending, `count` values; the first and last are min and max exactly. */
  values: number[];
}

/** A gain held at one value in every cell. */
export interface FixedGain {
  gain: string;
  path: string;
  unit: string;
  value: number;
}

/** The catalogue entry of a map gain, or undefined for a name that is not one. */
export function mapGainEntry(gain: string): CatalogueEntry | undefined {
  return MAP_GAIN_ENTRIES.find((e) => parameterName(e) === gain);
}

/**
 * The values of an axis. Linear: evenly spaced. Log: evenly spaced in log10 (min must be
 * positive). Both end on max exactly, so a range's ends are the values the user typed.
 * @example axisValues(1, 100, 3, 'log') // [1, 10, 100]
 */
export function axisValues(min: number, max: number, count: number, spacing: AxisSpacing): number[] {
  const values: number[] = [];
  for (let i = 0; i < count; i++) {
    const f = i / (count - 1);
    values.push(spacing === 'log' ? min * Math.pow(max / min, f) : min + (max - min) * f);
  }
  values[0] = min;
  values[count - 1] = max;
  return values;
}

/** What is wrong with a value of a map gain (range from the catalogue), or null. */
export function gainValueProblem(e: CatalogueEntry, value: number): string | null {
  return rangeViolation(e, value);
}
