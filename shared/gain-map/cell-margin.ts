import { LIMITED_METRICS, limitVerdicts, type LimitedMetric } from '../scenario/limit-verdicts';
import type { Scenario } from '../scenario/scenario-schema';
import type { CellMetrics } from './cell-metrics';

/**
 * Whether a cell meets the scenario's limits, and by how much.
 *
 * A cell meets the limits when it is stable and every limit the scenario sets holds by the shared
 * rule (limitVerdicts: an undefined metric never meets a limit). Its margin is the smallest
 * relative headroom over the set limits, (bound − value) / bound, with value = |steady-state
 * error| for that limit: 0.25 means the cell is at least 25 % inside its tightest limit. A limit
 * of 0 (which only 0 meets) has headroom 0. Margins are given only for cells that meet the limits,
 * so they are never negative.
 */
export interface CellVerdict {
  meetsLimits: boolean;
  /** Smallest relative headroom over the set limits (≥ 0), or null when the cell fails or no limit is set. */
  margin: number | null;
  /** The limit with the smallest headroom (the one that decides the margin), or null. */
  tightest: LimitedMetric | null;
}

/** True when the scenario sets at least one limit. */
export function hasLimits(limits: Scenario['limits']): boolean {
  return LIMITED_METRICS.some((k) => limits[k] !== null);
}

/** The verdict of one cell against the scenario's limits (see CellVerdict). */
export function cellVerdict(limits: Scenario['limits'], metrics: CellMetrics): CellVerdict {
  if (!hasLimits(limits)) return { meetsLimits: metrics.stable === true, margin: null, tightest: null };
  const verdicts = limitVerdicts(limits, metrics);
  const meetsLimits = metrics.stable === true && LIMITED_METRICS.every((k) => verdicts[k]?.met ?? true);
  if (!meetsLimits) return { meetsLimits, margin: null, tightest: null };
  let margin = Infinity;
  let tightest: LimitedMetric | null = null;
  for (const k of LIMITED_METRICS) {
    const v = verdicts[k];
    if (!v) continue;
    const headroom = v.bound === 0 ? 0 : (v.bound - v.value!) / v.bound;
    if (headroom < margin) {
      margin = headroom;
      tightest = k;
    }
  }
  return { meetsLimits, margin, tightest };
}
