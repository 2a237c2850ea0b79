import { describe, expect, it } from 'vitest';
import { axisValues, MAP_GAINS, MAX_AXIS_POINTS } from './gain-axes';
import { cellGains, cellPosition, chunkCells, planErrors, planGainMap, scenarioAtCell } from './gain-map-plan';
import { scenarioOf } from './testing/spec-scenario';

const scenario = scenarioOf({
  kind: 'kinetwin/scenario',
  version: 1,
  name: 'plan joint',
  joint: { inertia: 0.012, damping: 0.04, stiffness: 0 },
  controller: { mode: 'pid', kp: 6, ki: 1, kd: 0.4, derivativeOn: 'measurement' },
  inputs: [{ channel: 'reference', shape: 'step', amplitude: 0.5 }],
  horizon: 2,
});
const request = { x: { gain: 'kp', min: 0, max: 50, count: 5 }, y: { gain: 'kd', min: 0.01, max: 1, count: 3, spacing: 'log' } };

function errorsOf(req: unknown, s = scenario) {
  const plan = planGainMap(s, req);
  return plan.ok ? [] : plan.errors;
}

describe('gain map axes and plan', () => {
  it('sweeps the controller parameters the catalogue lets the form edit', () => {
    expect(MAP_GAINS).toEqual(['kp', 'ki', 'kd', 'derivativeFilter']);
  });

  it('spaces values linearly or in log10, ending on the typed ends exactly', () => {
    expect(axisValues(0, 50, 5, 'linear')).toEqual([0, 12.5, 25, 37.5, 50]);
    const log = axisValues(0.01, 1, 3, 'log');
    expect(log[0]).toBe(0.01);
    expect(log[1]).toBeCloseTo(0.1, 15);
    expect(log[2]).toBe(1);
  });

  it('plans rows along y and columns along x, and puts a cell’s gains into its scenario', () => {
    const plan = planGainMap(scenario, { ...request, z: { gain: 'ki', value: 3 } });
    if (!plan.ok) throw new Error(JSON.stringify(plan.errors));
    expect(plan.value.cells).toBe(15);
    expect(cellPosition(plan.value, 7)).toEqual({ row: 1, col: 2 });
    expect(cellGains(plan.value, 7)).toEqual({ kp: 25, kd: plan.value.y.values[1], ki: 3 });
    const cell = scenarioAtCell(scenario, plan.value, 14);
    expect(cell.controller).toMatchObject({ kp: 50, kd: 1, ki: 3, derivativeOn: 'measurement' });
    expect(scenario.controller.kp).toBe(6);
    expect(plan.value.x).toMatchObject({ path: 'controller.kp', unit: 'N·m/rad', spacing: 'linear' });
    // Plain data: a round trip through JSON gives the same plan, and it still checks out.
    const copy = JSON.parse(JSON.stringify(plan.value));
    expect(copy).toEqual(plan.value);
    expect(planErrors(copy)).toEqual([]);
  });

  it('deals the cells out in order in chunks', () => {
    const plan = planGainMap(scenario, request);
    if (!plan.ok) throw new Error('refused');
    expect(chunkCells(plan.value, 6)).toEqual([[0, 1, 2, 3, 4, 5], [6, 7, 8, 9, 10, 11], [12, 13, 14]]);
  });

  it.each([
    [{ ...request, x: { ...request.x, gain: 'kq' } }, 'x.gain', 'one of kp, ki, kd, derivativeFilter'],
    [{ ...request, x: { ...request.x, gain: 'samplePeriod' } }, 'x.gain', 'one of'],
    [{ ...request, y: { ...request.y, gain: 'kp' } }, 'y.gain', 'two different gains'],
    [{ ...request, z: { gain: 'kd', value: 1 } }, 'z.gain', 'already swept'],
    [{ ...request, x: { ...request.x, min: -1 } }, 'x.min', 'kp must be zero or more'],
    [{ ...request, x: { ...request.x, max: 1e9 } }, 'x.max', 'kp must be at most 1e8 N·m/rad'],
    [{ ...request, x: { ...request.x, min: 5, max: 5 } }, 'x.max', 'must be above min'],
    [{ ...request, x: { ...request.x, spacing: 'log' } }, 'x.min', 'log axis needs min above zero'],
    [{ ...request, x: { ...request.x, count: MAX_AXIS_POINTS + 1 } }, 'x.count', 'at most 200'],
    [{ ...request, x: { ...request.x, count: 1 } }, 'x.count', 'at least 2'],
    [{ ...request, x: { ...request.x, count: 2.5 } }, 'x.count', 'whole number'],
    [{ ...request, y: { ...request.y, spacing: 'cubic' } }, 'y.spacing', '"linear" or "log"'],
    [{ ...request, z: { gain: 'ki', value: 2e9 } }, 'z.value', 'ki must be at most 1e9'],
    [{ ...request, extra: 1 }, '', 'extra'],
    [{ x: request.x }, 'y', 'required'],
  ])('refuses %j naming %s', (req, field, message) => {
    const errors = errorsOf(req);
    expect(errors.length).toBeGreaterThan(0);
    expect(errors[0]!.field).toBe(field);
    expect(errors[0]!.message).toContain(message);
  });

  it('needs a closed loop', () => {
    const open = scenarioOf({ kind: 'kinetwin/scenario', version: 1, name: 'open', joint: { inertia: 1, damping: 1, stiffness: 1 }, controller: { mode: 'open-loop' }, horizon: 1 });
    expect(errorsOf(request, open)[0]).toMatchObject({ field: 'controller.mode' });
  });

  it('refuses a plan that arrives as tampered data, naming the field', () => {
    const plan = planGainMap(scenario, request);
    if (!plan.ok) throw new Error('refused');
    const bad = (patch: object) => planErrors({ ...plan.value, ...patch });
    expect(bad({ x: { ...plan.value.x, values: [0, 1e308] } })[0]).toMatchObject({ field: 'x.values.1', message: expect.stringContaining('at most 1e8') });
    expect(bad({ x: { ...plan.value.x, values: [3, 2] } })[0]).toMatchObject({ field: 'x.values.1', message: 'axis values must ascend' });
    expect(bad({ y: { ...plan.value.y, gain: 'inertia' } })[0]).toMatchObject({ field: 'y.gain' });
    expect(bad({ cells: 16 })[0]).toMatchObject({ field: 'cells' });
    expect(bad({ z: { gain: 'kp', path: 'controller.kp', unit: '', value: 1 } })[0]).toMatchObject({ field: 'z.gain' });
  });
});
