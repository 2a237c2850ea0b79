import type { Scenario } from './scenario-schema';

/** The metrics a scenario's `limits` can bound. */
export type LimitedMetric = keyof Scenario['limits'];

/** Every limited metric, in the order reports list them. */
export const LIMITED_METRICS: readonly LimitedMetric[] = ['overshootPercent', 'settlingTime', 'steadyStateError'];

/** The values a limit is judged on: %, s and rad; null where the metric is undefined. */
export type LimitedValues = Readonly<Record<LimitedMetric, number | null>>;

/** One limit of the scenario judged against its metric. */
export interface LimitVerdict {
  /** The scenario's bound: %, s or rad. */
  bound: number;
  /** The value judged (|steady-state error| for that limit); null when the metric is undefined. */
  value: number | null;
  met: boolean;
}

/**
 * The value a limit compares with its bound: the steady-state error by its size (an error of
 * either sign counts), the others as they are.
 */
export function limitedValue(metric: LimitedMetric, raw: number | null): number | null {
  if (raw === null) return null;
  return metric === 'steadyStateError' ? Math.abs(raw) : raw;
}

/**
 * Judges each set limit; unset (null) limits are left out. An undefined metric never meets a
 * limit: an unstable loop or a missing reference step cannot pass. The one rule the bench,
 * `kinetwin check` and the gain map share.
 * @example limitVerdicts({ overshootPercent: 10, settlingTime: null, steadyStateError: null }, metrics).overshootPercent // { bound: 10, value: 16.3, met: false }
 */
export function limitVerdicts(limits: Scenario['limits'], metrics: LimitedValues): Partial<Record<LimitedMetric, LimitVerdict>> {
  const verdicts: Partial<Record<LimitedMetric, LimitVerdict>> = {};
  for (const key of LIMITED_METRICS) {
    const bound = limits[key];
    if (bound === null) continue;
    const value = limitedValue(key, metrics[key]);
    verdicts[key] = { bound, value, met: value !== null && value <= bound };
  }
  return verdicts;
}
