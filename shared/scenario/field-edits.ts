import type { FieldError, Parsed } from '../validation/field-errors';
import { catalogueEntryAt, parameterName } from './parameter-catalogue';
import { choiceParameterAt } from './choice-parameters';
import { parseScenario } from './parse-scenario';
import type { Scenario } from './scenario-schema';

/**
 * Unsaved text of edited fields, keyed by dotted scenario path ("joint.inertia",
 * "inputs.0.delay", "controller.mode"); untouched fields have no entry.
 */
export type FieldEdits = Readonly<Record<string, string>>;

/** Plain decimal notation only: Number() alone would also take "0x10", "" and "Infinity". */
export const DECIMAL = /^[+-]?(\d+\.?\d*|\.\d+)(e[+-]?\d+)?$/i;

/**
 * The value at a dotted path of plain data ("inputs.0.amplitude"); undefined when the path
 * leads nowhere.
 * @example valueAtPath(scenario, 'controller.kp') // 4
 */
export function valueAtPath(data: unknown, path: string): unknown {
  let node = data;
  for (const key of path.split('.')) {
    if (node === null || typeof node !== 'object') return undefined;
    node = (node as Record<string, unknown>)[key];
  }
  return node;
}

/** Sets a leaf whose parent exists; the caller has checked the path with valueAtPath. */
function setAtPath(data: unknown, path: string, value: unknown): void {
  const keys = path.split('.');
  const parent = keys.length === 1 ? data : valueAtPath(data, keys.slice(0, -1).join('.'));
  (parent as Record<string, unknown>)[keys.at(-1)!] = value;
}

/**
 * Whether a path names a twin effect the scenario may gain or lose by an edit: a catalogued
 * number of the nonlinear block whose parent object exists (so a torque limit can be added to a
 * scenario without one, but a gravity arm only once the gravity load exists).
 */
export function isOptionalEffect(base: Scenario, path: string): boolean {
  const entry = catalogueEntryAt(path);
  if (entry?.group !== 'nonlinear') return false;
  const parent = valueAtPath(base, path.split('.').slice(0, -1).join('.'));
  return parent !== null && typeof parent === 'object';
}

/** The scenario's own value at a path as a form shows it: the number or text, "" when absent or null. */
export function fieldValueText(scenario: Scenario, path: string): string {
  const value = valueAtPath(scenario, path);
  return typeof value === 'number' || typeof value === 'string' ? String(value) : '';
}

/**
 * The base scenario with the edits applied, validated by the shared scenario schema. A path must
 * name a catalogued number or a choice parameter the scenario has (an absent optional term field
 * is no field of this scenario), or a twin effect it may gain (isOptionalEffect; empty text turns it off); a number's text must be plain decimal, else it gets its own
 * message (the schema would only see NaN). Every error names the dotted path. The base is untouched.
 * @example applyFieldEdits(gantry, { 'controller.kp': '6' }) // { ok: true, value: { …, controller: { …, kp: 6 } } }
 * @example applyFieldEdits(gantry, { 'joint.inertia': '' }) // { ok: false, errors: [{ field: 'joint.inertia', message: 'inertia is required' }] }
 */
export function applyFieldEdits(base: Scenario, edits: FieldEdits): Parsed<Scenario> {
  const draft = structuredClone(base) as unknown;
  const textErrors: FieldError[] = [];
  for (const [path, text] of Object.entries(edits)) {
    const number = catalogueEntryAt(path);
    const choice = choiceParameterAt(path);
    const effect = isOptionalEffect(base, path);
    if ((!number && !choice) || (valueAtPath(base, path) === undefined && !effect)) {
      textErrors.push({ field: path, message: `${path} is not a field of this scenario` });
      continue;
    }
    if (choice) {
      // The schema's enum judges the text; the choice list only gives it words.
      setAtPath(draft, path, text);
      continue;
    }
    const name = parameterName(number!);
    const trimmed = text.trim();
    // An effect left empty is off: the key goes, and the schema's default (none) applies.
    if (trimmed === '' && effect) delete (valueAtPath(draft, path.split('.').slice(0, -1).join('.')) as Record<string, unknown>)[path.split('.').at(-1)!];
    else if (trimmed === '') textErrors.push({ field: path, message: `${name} is required` });
    else if (!DECIMAL.test(trimmed) || !Number.isFinite(Number(trimmed))) textErrors.push({ field: path, message: `${name} must be a finite number, got "${text}"` });
    else setAtPath(draft, path, Number(trimmed));
  }
  const parsed = parseScenario(draft);
  if (textErrors.length === 0) return parsed;
  // A field with unreadable text keeps its base value in the draft; schema errors there would be about that value.
  const refused = new Set(textErrors.map((error) => error.field));
  const schemaErrors = parsed.ok ? [] : parsed.errors.filter((error) => !refused.has(error.field));
  return { ok: false, errors: [...textErrors, ...schemaErrors] };
}

/**
 * The edits that still differ from the base (a field typed back to its value is no edit; an
 * emptied field stays, so its "required" message shows).
 */
export function effectiveFieldEdits(base: Scenario, edits: FieldEdits): FieldEdits {
  return Object.fromEntries(
    Object.entries(edits).filter(([path, text]) => {
      const value = valueAtPath(base, path);
      if (typeof value === 'string') return text !== value;
      // An absent effect left empty is no edit.
      if ((value === undefined || value === null) && text.trim() === '') return false;
      return text.trim() === '' || Number(text.trim()) !== value;
    }),
  );
}
