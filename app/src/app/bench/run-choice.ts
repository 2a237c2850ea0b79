import type { RunStartRequest } from '@kinetwin/shared/protocol/run-events';
import { parseScenario } from '@kinetwin/shared/scenario/parse-scenario';
import type { InputTerm, Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import { withAppendedTerms } from '@kinetwin/shared/twin/kick-rule';
import type { FieldError } from '@kinetwin/shared/validation/field-errors';
import { applyFieldEdits } from '@kinetwin/shared/scenario/field-edits';
import { type ScenarioEdits, samePlainData } from './scenario-draft';

/** The run request the bench sends, or the edits' errors when they cannot be run. */
export type RunChoice =
  | {
      ok: true;
      request: RunStartRequest;
      /** The scenario that will run: the stored one, or the edited one when it goes inline. */
      scenario: Scenario;
      inline: boolean;
    }
  | { ok: false; errors: FieldError[] };

/**
 * Runs the stored scenario by id unless the edits change it; then the edited scenario goes
 * inline, for the server to validate again. Edits that only retype a saved value (0.010 for
 * 0.01) change nothing, so the stored scenario runs. Terms the draft kept (a run's kicks) come
 * after the saved inputs, before the edits apply, so edits may reach them ("inputs.2.delay").
 * @example runChoice(5, saved, {}) // { ok: true, request: { scenarioId: 5 }, scenario: saved, inline: false }
 */
export function runChoice(scenarioId: number, saved: Scenario, edits: ScenarioEdits, kept: readonly InputTerm[] = []): RunChoice {
  if (Object.keys(edits).length === 0 && kept.length === 0) return { ok: true, request: { scenarioId }, scenario: saved, inline: false };
  const base = withAppendedTerms(saved, kept);
  if (!base.ok) return base;
  const edited = applyFieldEdits(base.value, edits);
  if (!edited.ok) return edited;
  const stored = parseScenario(saved);
  if (stored.ok && samePlainData(stored.value, edited.value)) return { ok: true, request: { scenarioId }, scenario: saved, inline: false };
  return { ok: true, request: { scenario: edited.value }, scenario: edited.value, inline: true };
}
