import { choiceParameterAt, choiceText } from '@kinetwin/shared/scenario/choice-parameters';
import { catalogueEntryAt, fieldLabel } from '@kinetwin/shared/scenario/parameter-catalogue';
import type { DiffSection, DiffValue, ScenarioChange } from '@kinetwin/shared/library/scenario-diff';

/** Headings of the diff's sections, in the order an engineer reads a scenario. */
export const SECTION_LABELS: Record<DiffSection, string> = {
  name: 'Name',
  notes: 'Notes',
  joint: 'Joint',
  controller: 'Controller',
  initial: 'Initial state',
  inputs: 'Forcing terms',
  horizon: 'Horizon',
  limits: 'Limits',
  nonlinear: 'Twin effects',
};

/** One changed parameter as the diff table shows it. */
export interface DiffRow {
  path: string;
  /** The parameter inside its section, e.g. "kp" or "term 2 · amplitude". */
  label: string;
  kind: ScenarioChange['kind'];
  before: string;
  after: string;
  unit: string;
}

export interface DiffSectionRows {
  section: DiffSection;
  label: string;
  rows: DiffRow[];
}

/**
 * A value as the diff shows it: numbers exactly as stored (a diff must not hide a change by
 * rounding), "—" for absent or null, text in quotes so an empty string is visible.
 * @example formatDiffValue(0.1 + 0.2) // "0.30000000000000004"
 */
export function formatDiffValue(value: DiffValue): string {
  if (value === null) return '—';
  if (typeof value === 'string') return `“${value}”`;
  return String(value);
}

/** A changed value in words: a choice parameter's stored value as its list names it ("PID loop", not "pid"). */
function valueText(path: string, value: DiffValue): string {
  return typeof value === 'string' && choiceParameterAt(path) ? choiceText(path, value) : formatDiffValue(value);
}

/** A leaf's words: the catalogue's label and symbol, a choice parameter's label, else its key path. */
function leafLabel(path: string, rest: readonly string[]): string {
  const known = catalogueEntryAt(path) ?? choiceParameterAt(path);
  return known ? fieldLabel(known) : rest.join(' · ');
}

function rowLabel(change: ScenarioChange): string {
  const rest = change.path.split('.').slice(1);
  if (rest.length === 0) return SECTION_LABELS[change.section];
  if (change.section === 'inputs') {
    const [index, ...field] = rest;
    const term = `term ${Number(index) + 1}`;
    return field.length === 0 ? term : `${term} · ${leafLabel(change.path, field)}`;
  }
  return leafLabel(change.path, rest);
}

/**
 * The catalogue's unit; none for an amplitude, whose unit follows the term's channel and shape,
 * which may differ between the two revisions.
 */
function unitOf(change: ScenarioChange): string {
  const e = catalogueEntryAt(change.path);
  return !e || e.path === 'inputs[].amplitude' ? '' : e.unit;
}

/**
 * The diff's changes grouped by section in reading order, each with a readable label, its unit
 * and both values formatted; sections without changes are left out.
 * @example diffSectionRows([{ section: 'controller', path: 'controller.kp', kind: 'changed', before: 4, after: 6 }])
 * // [{ section: 'controller', label: 'Controller', rows: [{ label: 'kp', before: '4', after: '6', unit: 'N·m/rad', … }] }]
 */
export function diffSectionRows(changes: readonly ScenarioChange[]): DiffSectionRows[] {
  const order = Object.keys(SECTION_LABELS) as DiffSection[];
  return order
    .map((section) => ({
      section,
      label: SECTION_LABELS[section],
      rows: changes
        .filter((change) => change.section === section)
        .map((change) => ({
          path: change.path,
          label: rowLabel(change),
          kind: change.kind,
          before: valueText(change.path, change.before),
          after: valueText(change.path, change.after),
          unit: unitOf(change),
        })),
    }))
    .filter((group) => group.rows.length > 0);
}
