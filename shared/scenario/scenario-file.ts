import type { Scenario } from './scenario-schema';

/**
 * A scenario file as exported: the scenario document with the safety caution as its first key,
 * so the caution travels in the file itself (a header is lost the moment the file is saved).
 * Readers of files drop that key before validating, so an exported file imports as it is.
 */
export const SCENARIO_FILE_CAUTION_KEY = 'safetyCaution';

/**
 * The exported file's text: the caution first, then the document, two-space indented.
 * @example scenarioFileText(scenario, SAFETY_CAUTION) // '{\n  "safetyCaution": "A simulation is not…",\n  "kind": …'
 */
export function scenarioFileText(scenario: Scenario, caution: string): string {
  return JSON.stringify({ [SCENARIO_FILE_CAUTION_KEY]: caution, ...scenario }, null, 2) + '\n';
}

/**
 * The scenario document inside a file's JSON: the caution key dropped when it is text; anything
 * else is left for the scenario schema to judge (a non-text caution is refused there by name).
 */
export function scenarioOfFile(input: unknown): unknown {
  if (input === null || typeof input !== 'object' || Array.isArray(input)) return input;
  const { [SCENARIO_FILE_CAUTION_KEY]: caution, ...document } = input as Record<string, unknown>;
  return typeof caution === 'string' ? document : input;
}
