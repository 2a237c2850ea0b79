/** How a map's cells are evaluated: the closed form (linear, fast) or the twin (with its effects). */
export const GAIN_MAP_METHODS = ['closed-form', 'sim'] as const;
export type GainMapMethod = (typeof GAIN_MAP_METHODS)[number];

/** What one cell of a gain map reports; null where a metric is undefined there. */
export interface CellMetrics {
  /** Overshoot of the first reference step, %; null when the loop is unstable or never settles. */
  overshootPercent: number | null;
  /** 2 % settling time from the step, s; null likewise. */
  settlingTime: number | null;
  /** lim (r − θ) of the whole scenario, rad (signed); null when either has no final value. */
  steadyStateError: number | null;
  /** Largest real part of the linear loop's poles, 1/s: the slowest decay (≥ 0 grows). */
  slowestPoleReal: number | null;
  /**
   * closed-form: every loop pole left of the axis (marginal is not stable). sim: true when the
   * twin reached its horizon and the step settled, false when it ran into a bound, null when it
   * did neither (or there is no reference step).
   */
  stable: boolean | null;
  /** sim only: whether the superposition check holds for the cell (null for closed-form). */
  superpositionPass: boolean | null;
}

/** One evaluated cell: its index in the plan, metrics, and why any are null. */
export interface CellResult {
  index: number;
  metrics: CellMetrics;
  /** Why metrics are null (unstable, never settled, no reference step, the twin stopped), or null. */
  reason: string | null;
}

/** The metrics a map draws, in the order of the JSON and the CSV columns. */
export const MAP_METRICS = ['overshootPercent', 'settlingTime', 'steadyStateError', 'slowestPoleReal', 'stable', 'superpositionPass'] as const satisfies readonly (keyof CellMetrics)[];
export type MapMetric = (typeof MAP_METRICS)[number];

/** Unit of each metric as headers show it ("" for a verdict). */
export const MAP_METRIC_UNITS: Readonly<Record<MapMetric, string>> = {
  overshootPercent: '%',
  settlingTime: 's',
  steadyStateError: 'rad',
  slowestPoleReal: '1/s',
  stable: '',
  superpositionPass: '',
};

/** The metrics a method reports: superpositionPass needs the twin. */
export function metricsOf(method: GainMapMethod): readonly MapMetric[] {
  return method === 'sim' ? MAP_METRICS : MAP_METRICS.filter((m) => m !== 'superpositionPass');
}
