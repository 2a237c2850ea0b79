import type { Scenario } from '../scenario/scenario-schema';
import { parseWith, type FieldError, type Parsed } from '../validation/field-errors';
import { axisValues, gainValueProblem, mapGainEntry, MAP_GAINS, MAX_AXIS_POINTS, MIN_AXIS_POINTS, type FixedGain, type GainAxis } from './gain-axes';
import { gainMapRequestSchema } from './gain-map-request';

/**
 * A gain map's grid as plain data: it travels to worker threads and into job rows as it is.
 * Cell i sits at row ⌊i / x.values.length⌋ (along y) and column i mod x.values.length (along x).
 */
export interface GainMapPlan {
  x: GainAxis;
  y: GainAxis;
  z: FixedGain | null;
  /** x.values.length × y.values.length. */
  cells: number;
}

/**
 * Plans a gain map over a validated scenario: the request parsed with gainMapRequestSchema, each
 * range checked against the parameter catalogue (so every cell is a valid scenario), log axes
 * starting above zero, three different gains, and a closed loop to put them in. Errors name the
 * field ("x.min", "z.gain", "controller.mode").
 * @example planGainMap(scenario, { x: { gain: 'kp', min: 0, max: 50, count: 40 }, y: { gain: 'kd', min: 0, max: 5, count: 40 } })
 */
export function planGainMap(scenario: Scenario, request: unknown): Parsed<GainMapPlan> {
  const parsed = parseWith(gainMapRequestSchema, request);
  if (!parsed.ok) return parsed;
  const r = parsed.value;
  const errors: FieldError[] = [];
  if (scenario.controller.mode !== 'pid') errors.push({ field: 'controller.mode', message: 'a gain map needs a closed loop: controller.mode must be "pid"' });
  if (r.x.gain === r.y.gain) errors.push({ field: 'y.gain', message: `x and y both sweep ${r.x.gain}: choose two different gains` });
  if (r.z && (r.z.gain === r.x.gain || r.z.gain === r.y.gain)) errors.push({ field: 'z.gain', message: `${r.z.gain} is already swept: the fixed gain must be a third one` });
  const axis = (key: 'x' | 'y'): GainAxis | null => {
    const a = r[key];
    const e = mapGainEntry(a.gain)!;
    const before = errors.length;
    for (const end of ['min', 'max'] as const) {
      const problem = gainValueProblem(e, a[end]);
      if (problem) errors.push({ field: `${key}.${end}`, message: problem });
    }
    if (errors.length === before && !(a.max > a.min)) errors.push({ field: `${key}.max`, message: `max (${a.max}) must be above min (${a.min})` });
    if (a.spacing === 'log' && !(a.min > 0)) errors.push({ field: `${key}.min`, message: `a log axis needs min above zero, got ${a.min}` });
    if (errors.length > before) return null;
    return { gain: a.gain, path: e.path, symbol: e.symbol, label: e.label, unit: e.unit, spacing: a.spacing, min: a.min, max: a.max, values: axisValues(a.min, a.max, a.count, a.spacing) };
  };
  const x = axis('x');
  const y = axis('y');
  let z: FixedGain | null = null;
  if (r.z) {
    const e = mapGainEntry(r.z.gain)!;
    const problem = gainValueProblem(e, r.z.value);
    if (problem) errors.push({ field: 'z.value', message: problem });
    z = { gain: r.z.gain, path: e.path, unit: e.unit, value: r.z.value };
  }
  if (errors.length > 0 || !x || !y) return { ok: false, errors };
  return { ok: true, value: { x, y, z, cells: x.values.length * y.values.length } };
}

/**
 * Why a plan that arrived as data (a job row, a worker message) is not one planGainMap could
 * have made, or [] when it is sound: known gains, sizes, ascending in-range values.
 */
export function planErrors(plan: GainMapPlan): FieldError[] {
  const errors: FieldError[] = [];
  const axis = (key: 'x' | 'y') => {
    const a = plan?.[key];
    const e = a && mapGainEntry(a.gain);
    if (!a || !e || e.path !== a.path) return errors.push({ field: `${key}.gain`, message: `gain must be one of ${MAP_GAINS.join(', ')}` });
    const v = a.values;
    if (!Array.isArray(v) || v.length < MIN_AXIS_POINTS || v.length > MAX_AXIS_POINTS) return errors.push({ field: `${key}.values`, message: `an axis holds ${MIN_AXIS_POINTS} to ${MAX_AXIS_POINTS} values` });
    for (let i = 0; i < v.length; i++) {
      const problem = typeof v[i] === 'number' ? gainValueProblem(e, v[i]!) : `${a.gain} must be a finite number`;
      if (problem) return errors.push({ field: `${key}.values.${i}`, message: problem });
      if (i > 0 && !(v[i]! > v[i - 1]!)) return errors.push({ field: `${key}.values.${i}`, message: 'axis values must ascend' });
    }
    return 0;
  };
  axis('x');
  axis('y');
  if (errors.length > 0) return errors;
  if (plan.x.gain === plan.y.gain) errors.push({ field: 'y.gain', message: 'x and y must sweep different gains' });
  if (plan.z !== null) {
    const e = plan.z && mapGainEntry(plan.z.gain);
    if (!e || e.path !== plan.z.path || plan.z.gain === plan.x.gain || plan.z.gain === plan.y.gain) errors.push({ field: 'z.gain', message: 'the fixed gain must be a third map gain' });
    else {
      const problem = gainValueProblem(e, plan.z.value);
      if (problem) errors.push({ field: 'z.value', message: problem });
    }
  }
  if (plan.cells !== plan.x.values.length * plan.y.values.length) errors.push({ field: 'cells', message: 'cells must be the number of x values times the number of y values' });
  return errors;
}

/** Row (along y) and column (along x) of a cell index. */
export function cellPosition(plan: GainMapPlan, index: number): { row: number; col: number } {
  const nx = plan.x.values.length;
  return { row: Math.floor(index / nx), col: index % nx };
}

/** The gains of one cell by short name, the fixed gain included, e.g. { kp: 12.5, kd: 0.4 }. */
export function cellGains(plan: GainMapPlan, index: number): Record<string, number> {
  const { row, col } = cellPosition(plan, index);
  const gains: Record<string, number> = { [plan.x.gain]: plan.x.values[col]!, [plan.y.gain]: plan.y.values[row]! };
  if (plan.z) gains[plan.z.gain] = plan.z.value;
  return gains;
}

/** The scenario of one cell: its gains put into the controller, everything else as it was. */
export function scenarioAtCell(scenario: Scenario, plan: GainMapPlan, index: number): Scenario {
  return { ...scenario, controller: { ...scenario.controller, ...cellGains(plan, index) } };
}

/**
 * Cell indices 0 … cells−1 in chunks of at most `size`, in order: how a map is dealt to workers.
 * @example chunkCells(plan, 500) // [[0, …, 499], [500, …], …]
 */
export function chunkCells(plan: GainMapPlan, size: number): number[][] {
  const step = Math.max(1, Math.floor(size));
  const chunks: number[][] = [];
  for (let start = 0; start < plan.cells; start += step) {
    const end = Math.min(plan.cells, start + step);
    chunks.push(Array.from({ length: end - start }, (_, k) => start + k));
  }
  return chunks;
}
