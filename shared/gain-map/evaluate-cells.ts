import type { Scenario } from '../scenario/scenario-schema';
import { twinScenarioErrors } from '../twin/twin-scenario-errors';
import type { FieldError, Parsed } from '../validation/field-errors';
import { GAIN_MAP_METHODS, type CellResult, type GainMapMethod } from './cell-metrics';
import { closedFormCell } from './closed-form-cell';
import { planErrors, scenarioAtCell, type GainMapPlan } from './gain-map-plan';
import { twinCell } from './twin-cell';

/**
 * Why the scenario cannot be mapped by this method ([] when it can): a known method, a closed
 * loop, and for the twin what twinScenarioErrors asks. A job route can refuse before queueing.
 */
export function methodErrors(scenario: Scenario, method: GainMapMethod): FieldError[] {
  const errors: FieldError[] = [];
  if (!(GAIN_MAP_METHODS as readonly string[]).includes(method)) errors.push({ field: 'method', message: `method must be ${GAIN_MAP_METHODS.join(' or ')}` });
  if (scenario.controller.mode !== 'pid') errors.push({ field: 'controller.mode', message: 'a gain map needs a closed loop: controller.mode must be "pid"' });
  if (method === 'sim') errors.push(...twinScenarioErrors(scenario));
  return errors;
}

/**
 * Evaluates the listed cells of a map, in the order given, calling `onCell` after each (for
 * progress and partial results). Pure and synchronous: the job engine runs chunks of indices on
 * worker threads and gathers the results with summarizeGainMap. The plan is re-checked
 * (planErrors) because it may arrive as data; indices must be whole numbers inside the plan.
 * @example evaluateCells(scenario, plan, 'closed-form', [0, 1, 2]) // { ok: true, value: [{ index: 0, metrics, reason }, …] }
 */
export function evaluateCells(scenario: Scenario, plan: GainMapPlan, method: GainMapMethod, indices: readonly number[], onCell?: (cell: CellResult) => void): Parsed<CellResult[]> {
  const errors: FieldError[] = [...planErrors(plan).map((e) => ({ ...e, field: `plan.${e.field}` })), ...methodErrors(scenario, method)];
  if (errors.length === 0) {
    const bad = indices.findIndex((i) => !Number.isInteger(i) || i < 0 || i >= plan.cells);
    if (bad >= 0) errors.push({ field: `indices.${bad}`, message: `a cell index must be a whole number from 0 to ${plan.cells - 1}, got ${String(indices[bad])}` });
  }
  if (errors.length > 0) return { ok: false, errors };
  const evaluate = method === 'sim' ? twinCell : closedFormCell;
  const results: CellResult[] = [];
  for (const index of indices) {
    const cell: CellResult = { index, ...evaluate(scenarioAtCell(scenario, plan, index)) };
    results.push(cell);
    onCell?.(cell);
  }
  return { ok: true, value: results };
}
