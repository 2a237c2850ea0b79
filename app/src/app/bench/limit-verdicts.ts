import type { StepMetrics } from '@kinetwin/shared/closed-form/index';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';

/** The metrics a scenario's `limits` can bound. */
export type LimitedMetric = keyof Scenario['limits'];

/** One limit of the scenario judged against the closed form's metric. */
export interface LimitVerdict {
  /** The scenario's bound: %, s or rad. */
  bound: number;
  /** The value judged (|steady-state error| for that limit); null when the metric is undefined. */
  value: number | null;
  met: boolean;
}

/**
 * Judges each set limit; unset (null) limits are left out. An undefined metric never meets a
 * limit: an unstable loop or a missing reference step cannot pass.
 * @example limitVerdicts({ overshootPercent: 10, settlingTime: null, steadyStateError: null }, metrics).overshootPercent // { bound: 10, value: 16.3, met: false }
 */
export function limitVerdicts(limits: Scenario['limits'], metrics: StepMetrics): Partial<Record<LimitedMetric, LimitVerdict>> {
  const verdicts: Partial<Record<LimitedMetric, LimitVerdict>> = {};
  const judge = (key: LimitedMetric, raw: number | null) => {
    const bound = limits[key];
    if (bound === null) return;
    const value = raw === null ? null : key === 'steadyStateError' ? Math.abs(raw) : raw;
    verdicts[key] = { bound, value, met: value !== null && value <= bound };
  };
  judge('overshootPercent', metrics.overshootPercent);
  judge('settlingTime', metrics.settlingTime);
  judge('steadyStateError', metrics.steadyStateError);
  return verdicts;
}
