import { parseScenario } from '../../shared/scenario/parse-scenario';
import type { Scenario } from '../../shared/scenario/scenario-schema';
import { AppError } from '../http/app-error';

/** A scenario document from a request body, validated; field errors are named under `field`. */
export function scenarioFromBody(input: unknown, field: string): Scenario {
  if (input === undefined) throw AppError.badRequest(`The body needs a "${field}".`, [{ field, message: `${field} is required` }]);
  const parsed = parseScenario(input);
  if (!parsed.ok) {
    throw AppError.badRequest(
      'The scenario is not valid; nothing was saved.',
      parsed.errors.map((e) => ({ field: e.field ? `${field}.${e.field}` : field, message: e.message })),
    );
  }
  return parsed.value;
}
