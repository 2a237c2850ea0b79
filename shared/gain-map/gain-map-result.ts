import { LIMITED_METRICS, limitedValue, type LimitedMetric } from '../scenario/limit-verdicts';
import { catalogueEntry } from '../scenario/parameter-catalogue';
import type { Scenario } from '../scenario/scenario-schema';
import { cellVerdict, hasLimits } from './cell-margin';
import { metricsOf, type CellMetrics, type CellResult, type GainMapMethod, type MapMetric } from './cell-metrics';
import { cellGains, cellPosition, type GainMapPlan } from './gain-map-plan';
import type { FixedGain, GainAxis } from './gain-axes';

/** A matrix over the map: rows along y, columns along x; null where undefined or not yet computed. */
export type MapMatrix<T> = (T | null)[][];

/** One limit as a contour: draw `values` at `level` (the bound); the side at or below it meets the limit. */
export interface LimitContour {
  metric: LimitedMetric;
  bound: number;
  unit: string;
  level: number;
  /** The value the limit judges (|steady-state error| for that limit), null where undefined. */
  values: MapMatrix<number>;
}

/** The cell the map suggests: it meets every limit with the largest margin. */
export interface SuggestedCell {
  index: number;
  row: number;
  col: number;
  /** The cell's gains by short name, the fixed gain included. */
  gains: Record<string, number>;
  /** Smallest relative headroom over the set limits (cell-margin.ts). */
  margin: number;
  /** The limit that decides the margin. */
  tightest: LimitedMetric;
  metrics: CellMetrics;
}

/** A gain map as the CLI prints it and the app draws it; plain data. */
export interface GainMapResult {
  method: GainMapMethod;
  axes: { x: GainAxis; y: GainAxis; z: FixedGain | null };
  /** One matrix per metric the method reports (superpositionPass with sim only). */
  metrics: Partial<Record<MapMetric, MapMatrix<number | boolean>>>;
  /** Why a cell's metrics are null, or null. */
  reasons: MapMatrix<string>;
  limits: Scenario['limits'];
  /** Whether each cell meets every set limit (stable and within each); null where not computed. */
  meetsLimits: MapMatrix<boolean>;
  /** Margin of each cell that meets the limits, null elsewhere. */
  margin: MapMatrix<number>;
  contours: LimitContour[];
  suggested: SuggestedCell | null;
  /** The suggestion, or why there is none, in words. */
  statement: string;
  /** Cells computed so far, of plan.cells. */
  computed: number;
  cells: number;
}

const matrix = <T>(plan: GainMapPlan): MapMatrix<T> => plan.y.values.map(() => plan.x.values.map(() => null));

/**
 * Gathers evaluated cells (any subset, any order: partial maps draw as cells arrive) into the
 * map: matrices per metric, the limits' contours, which cells meet every limit, and the suggested
 * cell — the largest margin, the lowest index among equal margins — or a plain statement that
 * none meets them. Cells outside the plan or repeated are ignored (the first one counts).
 */
export function summarizeGainMap(scenario: Scenario, plan: GainMapPlan, method: GainMapMethod, cells: readonly CellResult[]): GainMapResult {
  const shown = metricsOf(method);
  const metrics: Partial<Record<MapMetric, MapMatrix<number | boolean>>> = {};
  for (const m of shown) metrics[m] = matrix(plan);
  const reasons = matrix<string>(plan);
  const meetsLimits = matrix<boolean>(plan);
  const margin = matrix<number>(plan);
  const limits = scenario.limits;
  const set = LIMITED_METRICS.filter((k) => limits[k] !== null);
  const contours: LimitContour[] = set.map((k) => ({ metric: k, bound: limits[k]!, unit: catalogueEntry(`limits.${k}`).unit, level: limits[k]!, values: matrix(plan) }));
  const seen = new Set<number>();
  let best: SuggestedCell | null = null;
  for (const cell of cells) {
    if (!Number.isInteger(cell.index) || cell.index < 0 || cell.index >= plan.cells || seen.has(cell.index)) continue;
    seen.add(cell.index);
    const { row, col } = cellPosition(plan, cell.index);
    for (const m of shown) metrics[m]![row]![col] = cell.metrics[m];
    reasons[row]![col] = cell.reason;
    for (const c of contours) c.values[row]![col] = limitedValue(c.metric, cell.metrics[c.metric]);
    const verdict = cellVerdict(limits, cell.metrics);
    meetsLimits[row]![col] = verdict.meetsLimits;
    margin[row]![col] = verdict.margin;
    if (verdict.margin === null || verdict.tightest === null) continue;
    if (!best || verdict.margin > best.margin || (verdict.margin === best.margin && cell.index < best.index)) {
      best = { index: cell.index, row, col, gains: cellGains(plan, cell.index), margin: verdict.margin, tightest: verdict.tightest, metrics: cell.metrics };
    }
  }
  return {
    method,
    axes: { x: plan.x, y: plan.y, z: plan.z },
    metrics,
    reasons,
    limits,
    meetsLimits,
    margin,
    contours,
    suggested: best,
    statement: statementOf(limits, best, seen.size, plan.cells),
    computed: seen.size,
    cells: plan.cells,
  };
}

function statementOf(limits: Scenario['limits'], best: SuggestedCell | null, computed: number, cells: number): string {
  const sofar = computed < cells ? ` (${computed} of ${cells} cells computed so far)` : '';
  if (!hasLimits(limits)) return `the scenario sets no limits (limits.overshootPercent, limits.settlingTime, limits.steadyStateError), so no cell is suggested${sofar}`;
  if (!best) return `no cell of the map meets every limit${sofar}`;
  const gains = Object.entries(best.gains)
    .map(([g, v]) => `${g} = ${Number(v.toPrecision(4))}`)
    .join(', ');
  return `${gains} meets every limit with a margin of ${(best.margin * 100).toFixed(1)} % (tightest: ${best.tightest})${sofar}`;
}
