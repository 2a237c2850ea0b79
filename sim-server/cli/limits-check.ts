import { type Scenario } from '../../shared/scenario/scenario-schema';
import { type StepMetrics } from '../../shared/closed-form/index';

/** One limit of the scenario judged against a metric. */
export interface LimitVerdict {
  limit: 'overshootPercent' | 'settlingTime' | 'steadyStateError';
  /** The scenario's bound (%, s or rad). */
  bound: number;
  /** The measured metric (|steady-state error| for that limit); null when undefined. */
  value: number | null;
  met: boolean;
  reason: string | null;
}

/**
 * Judges the scenario's limits (null limits are skipped). An undefined metric never meets a
 * limit: an unstable loop or a missing reference step cannot pass a check.
 * @example checkLimits(scenario.limits, metrics, null) // [{ limit: 'overshootPercent', bound: 10, value: 16.3, met: false, … }]
 */
export function checkLimits(limits: Scenario['limits'], metrics: StepMetrics, whyUndefined: string | null): LimitVerdict[] {
  const verdicts: LimitVerdict[] = [];
  const judge = (limit: LimitVerdict['limit'], bound: number | null, raw: number | null) => {
    if (bound === null) return;
    const value = raw === null ? null : limit === 'steadyStateError' ? Math.abs(raw) : raw;
    if (value === null) {
      verdicts.push({ limit, bound, value, met: false, reason: `${limit} is undefined${whyUndefined ? `: ${whyUndefined}` : ''}` });
      return;
    }
    const met = value <= bound;
    verdicts.push({ limit, bound, value, met, reason: met ? null : `${limit} ${value} exceeds the limit ${bound}` });
  };
  judge('overshootPercent', limits.overshootPercent, metrics.overshootPercent);
  judge('settlingTime', limits.settlingTime, metrics.settlingTime);
  judge('steadyStateError', limits.steadyStateError, metrics.steadyStateError);
  return verdicts;
}
