import { parseScenario } from '@kinetwin/shared/scenario/parse-scenario';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import type { FieldError, Parsed } from '@kinetwin/shared/validation/field-errors';

/**
 * The bench's unsaved edits: the text typed into each tuning field, keyed by the field's dotted
 * scenario path ("joint.inertia", "inputs.0.delay"). Only edited fields have an entry.
 */
export type ScenarioEdits = Readonly<Record<string, string>>;

/** Plain decimal notation only: Number() alone would also take "0x10", "" and "Infinity". */
export const DECIMAL = /^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i;

/** The value at a dotted path of plain data; undefined when the path leads nowhere. */
export function valueAtPath(data: unknown, path: string): unknown {
  let node = data;
  for (const key of path.split('.')) {
    if (node === null || typeof node !== 'object') return undefined;
    node = (node as Record<string, unknown>)[key];
  }
  return node;
}

function setAtPath(data: unknown, path: string, value: unknown): boolean {
  const keys = path.split('.');
  let node = data;
  for (const key of keys.slice(0, -1)) {
    if (node === null || typeof node !== 'object') return false;
    node = (node as Record<string, unknown>)[key];
  }
  if (node === null || typeof node !== 'object') return false;
  (node as Record<string, unknown>)[keys[keys.length - 1]] = value;
  return true;
}

/** What a tuning field shows: the edit when there is one, else the saved value as text. */
export function fieldText(saved: Scenario, edits: ScenarioEdits, path: string): string {
  const edit = edits[path];
  if (edit !== undefined) return edit;
  const value = valueAtPath(saved, path);
  return typeof value === 'number' || typeof value === 'string' ? String(value) : '';
}

/**
 * The saved scenario with the edits applied, validated by the shared scenario schema. A field
 * whose saved value is a number takes the edit as a decimal number; text that is not one gets
 * its own message (zod would only see NaN). Errors name the dotted field.
 * @example editedScenario(saved, { 'joint.inertia': '-1' }) // { ok: false, errors: [{ field: 'joint.inertia', message: 'inertia must be positive' }] }
 */
export function editedScenario(saved: Scenario, edits: ScenarioEdits): Parsed<Scenario> {
  const draft = structuredClone(saved) as unknown;
  const textErrors: FieldError[] = [];
  for (const [path, text] of Object.entries(edits)) {
    const savedValue = valueAtPath(saved, path);
    if (savedValue === undefined) {
      textErrors.push({ field: path, message: `${path} is not a field of this scenario` });
      continue;
    }
    if (typeof savedValue === 'string') {
      setAtPath(draft, path, text);
      continue;
    }
    const name = path.split('.').at(-1) ?? path;
    const trimmed = text.trim();
    if (trimmed === '') {
      textErrors.push({ field: path, message: `${name} is required` });
    } else if (!DECIMAL.test(trimmed) || !Number.isFinite(Number(trimmed))) {
      textErrors.push({ field: path, message: `${name} must be a finite number, got "${text}"` });
    } else {
      setAtPath(draft, path, Number(trimmed));
    }
  }
  const parsed = parseScenario(draft);
  if (textErrors.length === 0) return parsed;
  // A field with unreadable text keeps its saved value in the draft; schema errors there would be about that value.
  const refused = new Set(textErrors.map((error) => error.field));
  const schemaErrors = parsed.ok ? [] : parsed.errors.filter((error) => !refused.has(error.field));
  return { ok: false, errors: [...textErrors, ...schemaErrors] };
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
