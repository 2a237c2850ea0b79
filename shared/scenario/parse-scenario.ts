import { parseWith, type Parsed } from '../validation/field-errors';
import { scenarioOfFile } from './scenario-file';
import { scenarioSchema, type Scenario } from './scenario-schema';

/**
 * Validates a scenario document (already parsed from JSON) and fills in defaults.
 * @example parseScenario(JSON.parse(text)) // { ok: true, value } or { ok: false, errors }
 */
export function parseScenario(input: unknown): Parsed<Scenario> {
  return parseWith(scenarioSchema, input);
}

/**
 * Validates scenario JSON text (a file: its safety caution line is dropped first); a syntax
 * error becomes a field error on the whole document.
 */
export function parseScenarioText(text: string): Parsed<Scenario> {
  let doc: unknown;
  try {
    doc = JSON.parse(text);
  } catch (err) {
    return { ok: false, errors: [{ field: '', message: `not valid JSON: ${(err as Error).message}` }] };
  }
  return parseScenario(scenarioOfFile(doc));
}
