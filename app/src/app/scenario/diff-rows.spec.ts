import type { ScenarioChange } from '@kinetwin/shared/library/scenario-diff';
import { catalogueEntry, fieldLabel } from '@kinetwin/shared/scenario/parameter-catalogue';
import { diffSectionRows, formatDiffValue } from './diff-rows';

const label = (path: string) => fieldLabel(catalogueEntry(path));

describe('diffSectionRows', () => {
  const changes: ScenarioChange[] = [
    { section: 'inputs', path: 'inputs.1.amplitude', kind: 'changed', before: -1, after: -2 },
    { section: 'controller', path: 'controller.kp', kind: 'changed', before: 4, after: 6.5 },
    { section: 'inputs', path: 'inputs.2.delay', kind: 'added', before: null, after: 0.4 },
    { section: 'name', path: 'name', kind: 'changed', before: 'Gantry', after: 'Gantry tuned' },
    { section: 'limits', path: 'limits.settlingTime', kind: 'changed', before: null, after: 1.2 },
  ];

  it('groups changes by section in reading order, leaving out sections without changes', () => {
    expect(diffSectionRows(changes).map((group) => group.label)).toEqual(['Name', 'Controller', 'Forcing terms', 'Limits']);
  });

  it('labels parameters inside their section, numbering forcing terms from 1, with their SI unit', () => {
    const rows = diffSectionRows(changes).flatMap((group) => group.rows);
    expect(rows.map((row) => [row.label, row.before, row.after, row.unit, row.kind])).toEqual([
      ['Name', '“Gantry”', '“Gantry tuned”', '', 'changed'],
      [label('controller.kp'), '4', '6.5', 'N·m/rad', 'changed'],
      [`term 2 · ${label('inputs[].amplitude')}`, '-1', '-2', '', 'changed'],
      [`term 3 · ${label('inputs[].delay')}`, '—', '0.4', 's', 'added'],
      [label('limits.settlingTime'), '—', '1.2', 's', 'changed'],
    ]);
  });

  it('shows numbers exactly as stored, so a tiny change is never rounded away', () => {
    expect(formatDiffValue(0.1 + 0.2)).toBe('0.30000000000000004');
    expect(formatDiffValue(1e-12)).toBe('1e-12');
    expect(formatDiffValue('')).toBe('“”');
    expect(formatDiffValue(false)).toBe('false');
  });

  it('labels a choice parameter from its list and a whole added term by its number', () => {
    const rows = diffSectionRows([
      { section: 'controller', path: 'controller.mode', kind: 'changed', before: 'pid', after: 'open-loop' },
      { section: 'inputs', path: 'inputs.0.channel', kind: 'changed', before: 'reference', after: 'torque' },
    ]).flatMap((group) => group.rows);
    expect(rows.map((row) => row.label)).toEqual(['Controller', 'term 1 · channel']);
    // The mode's values in the words the select and the summary use.
    expect([rows[0]!.before, rows[0]!.after]).toEqual(['PID loop', 'open loop']);
  });

  it('gives no sections for two identical revisions', () => {
    expect(diffSectionRows([])).toEqual([]);
  });
});
