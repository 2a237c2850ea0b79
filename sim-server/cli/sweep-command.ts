import { MAP_METRIC_UNITS, metricsOf, type CellResult } from '../../shared/gain-map/cell-metrics';
import { cellVerdict, hasLimits } from '../../shared/gain-map/cell-margin';
import type { GainAxis } from '../../shared/gain-map/gain-axes';
import { cellGains, cellPosition, type GainMapPlan } from '../../shared/gain-map/gain-map-plan';
import type { GainMapResult } from '../../shared/gain-map/gain-map-result';
import { SAFETY_CAUTION } from '../../shared/protocol/library-api';
import type { Scenario } from '../../shared/scenario/scenario-schema';
import { EXIT_LIMITS_NOT_MET, EXIT_OK } from './check-command';
import type { ResponseFormat } from './cli-arguments';

/**
 * `kinetwin sweep` as a JSON document: the axes, a matrix per metric (rows along y, columns
 * along x, null where undefined), which cells meet every limit and by what margin, the limits'
 * contours, the suggested cell with its statement, and the safety caution (suggested gains leave
 * the tool here).
 */
export function sweepDocument(scenario: Scenario, map: GainMapResult): object {
  const axis = (a: GainAxis) => ({ gain: a.gain, path: a.path, unit: a.unit, spacing: a.spacing, min: a.min, max: a.max, values: a.values });
  return {
    scenario: scenario.name,
    method: map.method,
    axes: { x: axis(map.axes.x), y: axis(map.axes.y), z: map.axes.z },
    units: Object.fromEntries(metricsOf(map.method).map((m) => [m, MAP_METRIC_UNITS[m]])),
    metrics: map.metrics,
    limits: map.limits,
    meetsLimits: map.meetsLimits,
    margin: map.margin,
    contours: map.contours,
    suggested: map.suggested,
    statement: map.statement,
    reasons: map.reasons,
    safety: SAFETY_CAUTION,
  };
}

/** A CSV field: quoted when it holds a comma, quote or line break (RFC 4180). */
function field(value: string | number | boolean | null): string {
  if (value === null) return '';
  const text = String(value);
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
}

const headed = (name: string, unit: string) => (unit ? `${name} [${unit}]` : name);

/**
 * One CSV row per cell in index order (rows of the map along y): row, column, the gains with
 * their units, each metric with its unit in the header, meetsLimits, margin and the reason a
 * metric is empty. Empty cells are undefined metrics.
 */
export function sweepCsv(scenario: Scenario, plan: GainMapPlan, map: GainMapResult, cells: readonly CellResult[]): string {
  const metrics = metricsOf(map.method);
  const gains = [plan.x, plan.y, ...(plan.z ? [plan.z] : [])];
  const header = ['row', 'col', ...gains.map((g) => headed(g.gain, g.unit)), ...metrics.map((m) => headed(m, MAP_METRIC_UNITS[m])), 'meetsLimits', 'margin', 'reason'];
  const lines = [header.join(',')];
  for (const cell of [...cells].sort((a, b) => a.index - b.index)) {
    const { row, col } = cellPosition(plan, cell.index);
    const g = cellGains(plan, cell.index);
    const verdict = cellVerdict(scenario.limits, cell.metrics);
    lines.push([row, col, ...gains.map((a) => g[a.gain]!), ...metrics.map((m) => cell.metrics[m]), verdict.meetsLimits, verdict.margin, cell.reason].map(field).join(','));
  }
  return `${lines.join('\n')}\n`;
}

/** What `kinetwin sweep` prints, and its exit code: 1 when the scenario sets limits and no cell meets them all. */
export function sweepOutput(scenario: Scenario, plan: GainMapPlan, map: GainMapResult, cells: readonly CellResult[], format: ResponseFormat): { text: string; exitCode: number } {
  const text = format === 'json' ? `${JSON.stringify(sweepDocument(scenario, map), null, 2)}\n` : sweepCsv(scenario, plan, map, cells);
  return { text, exitCode: hasLimits(scenario.limits) && map.suggested === null ? EXIT_LIMITS_NOT_MET : EXIT_OK };
}
