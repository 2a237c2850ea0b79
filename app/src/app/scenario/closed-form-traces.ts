import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import type { Parsed } from '@kinetwin/shared/validation/field-errors';
import type { AngleTrace } from './trace-scale';

/** The closed-form engine from shared/, fetched on first use so the scenario page draws first. */
type ClosedFormEngine = typeof import('@kinetwin/shared/closed-form/index');

/** Intervals of each overlaid trace over its horizon: smooth at the overlay's width. */
export const OVERLAY_TRACE_INTERVALS = 2000;

let loading: Promise<ClosedFormEngine> | null = null;

function loadEngine(): Promise<ClosedFormEngine> {
  loading ??= import('@kinetwin/shared/closed-form/index').catch((failure: unknown) => {
    loading = null;
    throw failure;
  });
  return loading;
}

/**
 * The closed-form angle of a scenario over its horizon, or field errors when it has no closed
 * form (the engine refuses it) or a sample is not finite. Never throws.
 */
export function closedFormTrace(engine: ClosedFormEngine, scenario: Scenario): Parsed<AngleTrace> {
  try {
    const solved = engine.solveClosedForm(scenario);
    if (!solved.ok) return solved;
    const sampled = engine.evaluateClosedForm(solved.value, scenario.horizon / OVERLAY_TRACE_INTERVALS, scenario.horizon);
    if (!sampled.ok) return sampled;
    return { ok: true, value: { t: sampled.value.t, angle: sampled.value.angle } };
  } catch (failure) {
    return { ok: false, errors: [{ field: '', message: `the closed form could not be computed: ${failure instanceof Error ? failure.message : String(failure)}` }] };
  }
}

/** Loads the engine and computes the closed-form traces of several scenarios. */
export async function closedFormTraces(scenarios: readonly Scenario[]): Promise<Parsed<AngleTrace>[]> {
  const engine = await loadEngine();
  return scenarios.map((scenario) => closedFormTrace(engine, scenario));
}
