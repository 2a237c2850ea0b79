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

/** SI units of the scenario's numeric leaves (README, "Scenario files"); absent means none. */
const UNITS: Record<string, string> = {
  'joint.inertia': 'kg·m²',
  'joint.damping': 'N·m·s/rad',
  'joint.stiffness': 'N·m/rad',
  'controller.kp': 'N·m/rad',
  'controller.ki': 'N·m/(rad·s)',
  'controller.kd': 'N·m·s/rad',
  'controller.derivativeFilter': 's',
  'controller.samplePeriod': 's',
  'initial.angle': 'rad',
  'initial.velocity': 'rad/s',
  horizon: 's',
  'limits.overshootPercent': '%',
  'limits.settlingTime': 's',
  'limits.steadyStateError': 'rad',
  'nonlinear.torqueLimit': 'N·m',
  'nonlinear.coulombFriction': 'N·m',
  'nonlinear.staticFriction': 'N·m',
  'nonlinear.deadBand': 'N·m',
  'nonlinear.noiseStdDev': 'rad',
};

const TERM_UNITS: Record<string, string> = { delay: 's', width: 's', frequency: 'rad/s', rate: '1/s' };

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

function rowLabel(change: ScenarioChange): string {
  const rest = change.path.split('.').slice(1);
  if (rest.length === 0) return SECTION_LABELS[change.section];
  if (change.section === 'inputs') {
    const [index, ...field] = rest;
    return [`term ${Number(index) + 1}`, ...field].join(' · ');
  }
  return rest.join(' · ');
}

function unitOf(change: ScenarioChange): string {
  if (change.section === 'inputs') return TERM_UNITS[change.path.split('.').at(-1) ?? ''] ?? '';
  return UNITS[change.path] ?? '';
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
          before: formatDiffValue(change.before),
          after: formatDiffValue(change.after),
          unit: unitOf(change),
        })),
    }))
    .filter((group) => group.rows.length > 0);
}
