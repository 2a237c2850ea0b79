import { type Scenario } from '../../shared/scenario/scenario-schema';
import { type StepMetrics } from '../../shared/closed-form/index';
import { LIMITED_METRICS, limitVerdicts, type LimitedMetric } from '../../shared/scenario/limit-verdicts';

/** One limit of the scenario judged against a metric, as `kinetwin check` prints it. */
export interface LimitVerdict {
  limit: LimitedMetric;
  /** The scenario's bound (%, s or rad). */
  bound: number;
  /** The measured metric (|steady-state error| for that limit); null when undefined. */
  value: number | null;
  met: boolean;
  reason: string | null;
}

/**
 * Judges the scenario's limits (null limits are skipped) by the shared rule (limitVerdicts) and
 * says why each unmet one fails.
 * @example checkLimits(scenario.limits, metrics, null) // [{ limit: 'overshootPercent', bound: 10, value: 16.3, met: false, … }]
 */
export function checkLimits(limits: Scenario['limits'], metrics: StepMetrics, whyUndefined: string | null): LimitVerdict[] {
  const verdicts = limitVerdicts(limits, metrics);
  return LIMITED_METRICS.flatMap((limit) => {
    const v = verdicts[limit];
    if (!v) return [];
    const reason = v.value === null ? `${limit} is undefined${whyUndefined ? `: ${whyUndefined}` : ''}` : v.met ? null : `${limit} ${v.value} exceeds the limit ${v.bound}`;
    return [{ limit, ...v, reason }];
  });
}
