import { parseScenario } from '../scenario/parse-scenario';
import { resolveNonlinear } from '../scenario/nonlinear-schema';
import type { Scenario } from '../scenario/scenario-schema';
import type { FieldError, Parsed } from '../validation/field-errors';
import { missingRecordingErrors, type TwinScenario } from './recorded-samples';

/**
 * Most controller samples one twin run may take. Beyond it a run would hold the CPU for minutes
 * (each sample restarts the integrator), so such a scenario is refused up front.
 */
export const MAX_CONTROLLER_SAMPLES = 10_000_000;

/**
 * Checks that involve more than one part of a scenario and matter to the twin only: effects on
 * the measured angle need a sampled controller to measure it, the number of samples is capped, and
 * a recorded input needs its samples (withRecordings in recorded-samples.ts).
 * @example twinScenarioErrors(scenario) // [] when the twin can run it
 */
export function twinScenarioErrors(scenario: TwinScenario): FieldError[] {
  const errors: FieldError[] = missingRecordingErrors(scenario);
  const nl = resolveNonlinear(scenario.nonlinear);
  const { controller } = scenario;
  const sampled = controller.mode === 'pid' && controller.samplePeriod !== null;
  const needsSampling: [string, boolean][] = [
    ['encoderCounts', nl.encoderCounts > 0],
    ['noiseStdDev', nl.noiseStdDev > 0],
    ['computeDelay', nl.computeDelay],
  ];
  for (const [field, on] of needsSampling) {
    if (!on || sampled) continue;
    const message =
      controller.mode === 'open-loop'
        ? `${field} acts on the controller's measurement, and an open-loop scenario has no controller`
        : `${field} acts on a sampled measurement: set controller.samplePeriod`;
    errors.push({ field: `nonlinear.${field}`, message });
  }
  if (sampled && scenario.horizon / controller.samplePeriod! > MAX_CONTROLLER_SAMPLES) {
    errors.push({
      field: 'controller.samplePeriod',
      message: `samplePeriod ${controller.samplePeriod} s gives more than ${MAX_CONTROLLER_SAMPLES} samples over the ${scenario.horizon} s horizon`,
    });
  }
  return errors;
}

/**
 * Parses a scenario for the twin: the scenario schema, then twinScenarioErrors.
 * @example parseTwinScenario(JSON.parse(text)) // { ok: true, value } or { ok: false, errors }
 */
export function parseTwinScenario(input: unknown): Parsed<Scenario> {
  const parsed = parseScenario(input);
  if (!parsed.ok) return parsed;
  const errors = twinScenarioErrors(parsed.value);
  return errors.length === 0 ? parsed : { ok: false, errors };
}
