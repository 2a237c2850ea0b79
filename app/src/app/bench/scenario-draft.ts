import type { FieldEdits } from '@kinetwin/shared/scenario/field-edits';
import { fieldValueText } from '@kinetwin/shared/scenario/field-edits';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';

/**
 * The bench's unsaved edits: the text typed into each tuning field, keyed by the field's dotted
 * scenario path ("joint.inertia", "inputs.0.delay"). Only edited fields have an entry; the shared
 * applyFieldEdits (shared/scenario/field-edits.ts) turns them into a scenario.
 */
export type ScenarioEdits = FieldEdits;

/** What a tuning field shows: the edit when there is one, else the saved value as text. */
export function fieldText(saved: Scenario, edits: ScenarioEdits, path: string): string {
  return edits[path] ?? fieldValueText(saved, path);
}

/**
 * Whether two pieces of JSON-like data are equal, ignoring key order (a stored scenario may come
 * back from the database with its keys reordered) and keys whose value is undefined.
 */
export function samePlainData(a: unknown, b: unknown): boolean {
  if (a === b) return true;
  if (a === null || b === null || typeof a !== 'object' || typeof b !== 'object') return false;
  if (Array.isArray(a) !== Array.isArray(b)) return false;
  const keysOf = (value: object) => Object.keys(value).filter((key) => (value as Record<string, unknown>)[key] !== undefined);
  const keysA = keysOf(a);
  const keysB = keysOf(b);
  if (keysA.length !== keysB.length) return false;
  return keysA.every((key) => samePlainData((a as Record<string, unknown>)[key], (b as Record<string, unknown>)[key]));
}
