import type { Scenario } from '../scenario/scenario-schema';

/** Parts of a scenario the diff reports on, in the order an engineer reads a scenario. */
export const diffSections = ['name', 'notes', 'joint', 'controller', 'initial', 'inputs', 'horizon', 'limits', 'nonlinear'] as const;
export type DiffSection = (typeof diffSections)[number];

/** A value of a scenario leaf as the diff reports it; undefined (absent) is reported as null. */
export type DiffValue = string | number | boolean | null;

/** One parameter that differs between two revisions. */
export interface ScenarioChange {
  section: DiffSection;
  /** Dotted path into the scenario, e.g. "controller.kp" or "inputs.1.amplitude". */
  path: string;
  kind: 'changed' | 'added' | 'removed';
  before: DiffValue;
  after: DiffValue;
}

/**
 * The parameter differences between two validated scenarios, leaf by leaf. Input terms are
 * compared by position (term 2 of one against term 2 of the other); a term present in only one
 * side is reported field by field as added or removed. Numbers compare exactly: a diff must
 * show any change that would change a run.
 * @example diffScenarios(a, { ...a, controller: { ...a.controller, kp: 12 } })
 * // [{ section: 'controller', path: 'controller.kp', kind: 'changed', before: 8, after: 12 }]
 */
export function diffScenarios(before: Scenario, after: Scenario): ScenarioChange[] {
  const changes: ScenarioChange[] = [];
  for (const section of diffSections) walk(section, section, before[section], after[section], changes);
  return changes;
}

function walk(section: DiffSection, path: string, a: unknown, b: unknown, out: ScenarioChange[]): void {
  const aIsNode = isNode(a);
  const bIsNode = isNode(b);
  if (aIsNode || bIsNode) {
    const keys = new Set([...keysOf(a), ...keysOf(b)]);
    for (const key of [...keys].sort(byIndexThenName)) walk(section, `${path}.${key}`, child(a, key), child(b, key), out);
    return;
  }
  if (Object.is(a, b) || (a === undefined && b === null) || (a === null && b === undefined)) return;
  const kind = a === undefined ? 'added' : b === undefined ? 'removed' : 'changed';
  out.push({ section, path, kind, before: leaf(a), after: leaf(b) });
}

function isNode(v: unknown): v is Record<string, unknown> | unknown[] {
  return typeof v === 'object' && v !== null;
}

function keysOf(v: unknown): string[] {
  return isNode(v) ? Object.keys(v) : [];
}

function child(v: unknown, key: string): unknown {
  return isNode(v) ? (v as Record<string, unknown>)[key] : undefined;
}

// Array positions sort numerically (10 after 9), object keys alphabetically.
function byIndexThenName(x: string, y: string): number {
  const nx = Number(x);
  const ny = Number(y);
  if (Number.isInteger(nx) && Number.isInteger(ny)) return nx - ny;
  return x < y ? -1 : x > y ? 1 : 0;
}

function leaf(v: unknown): DiffValue {
  if (v === undefined || v === null) return null;
  if (typeof v === 'string' || typeof v === 'number' || typeof v === 'boolean') return v;
  return JSON.stringify(v);
}
