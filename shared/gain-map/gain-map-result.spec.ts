import { describe, expect, it } from 'vitest';
import type { Scenario } from '../scenario/scenario-schema';
import { cellVerdict } from './cell-margin';
import type { CellMetrics, CellResult } from './cell-metrics';
import { evaluateCells } from './evaluate-cells';
import { planGainMap, type GainMapPlan } from './gain-map-plan';
import { summarizeGainMap } from './gain-map-result';
import { allCells, scenarioOf } from './testing/spec-scenario';

const base = scenarioOf({
  kind: 'kinetwin/scenario',
  version: 1,
  name: 'summary joint',
  joint: { inertia: 0.012, damping: 0.04, stiffness: 0 },
  controller: { mode: 'pid', kp: 6, ki: 1, kd: 0.4, derivativeOn: 'measurement' },
  inputs: [{ channel: 'reference', shape: 'step', amplitude: 0.5, delay: 0.1 }],
  horizon: 2,
  limits: { overshootPercent: 10, settlingTime: 0.5, steadyStateError: 0.01 },
});

const planned = planGainMap(base, { x: { gain: 'kp', min: 1, max: 3, count: 3 }, y: { gain: 'kd', min: 0.1, max: 0.2, count: 2 } });
if (!planned.ok) throw new Error(JSON.stringify(planned.errors));
const plan: GainMapPlan = planned.value;

const metrics = (patch: Partial<CellMetrics>): CellMetrics => ({ overshootPercent: 5, settlingTime: 0.25, steadyStateError: -0.001, slowestPoleReal: -3, stable: true, superpositionPass: null, ...patch });
const cell = (index: number, patch: Partial<CellMetrics> = {}): CellResult => ({ index, metrics: metrics(patch), reason: null });

describe('cell margin', () => {
  it('is the smallest relative headroom over the set limits, |steady-state error| included', () => {
    // Headroom: overshoot (10 − 5)/10 = 0.5, settling (0.5 − 0.25)/0.5 = 0.5, error (0.01 − 0.008)/0.01 = 0.2.
    expect(cellVerdict(base.limits, metrics({ steadyStateError: -0.008 }))).toEqual({ meetsLimits: true, margin: expect.closeTo(0.2, 12), tightest: 'steadyStateError' });
  });

  it('is null for a cell that fails a limit, is unstable or has an undefined metric', () => {
    expect(cellVerdict(base.limits, metrics({ overshootPercent: 12 }))).toEqual({ meetsLimits: false, margin: null, tightest: null });
    expect(cellVerdict(base.limits, metrics({ stable: false }))).toMatchObject({ meetsLimits: false });
    expect(cellVerdict(base.limits, metrics({ settlingTime: null }))).toMatchObject({ meetsLimits: false });
  });

  it('counts a zero limit met only by zero, with no headroom', () => {
    const limits: Scenario['limits'] = { overshootPercent: 0, settlingTime: null, steadyStateError: null };
    expect(cellVerdict(limits, metrics({ overshootPercent: 0 }))).toEqual({ meetsLimits: true, margin: 0, tightest: 'overshootPercent' });
    expect(cellVerdict(limits, metrics({ overshootPercent: 1e-6 }))).toMatchObject({ meetsLimits: false });
  });
});

describe('summarizeGainMap', () => {
  it('lays matrices out with rows along y and suggests the largest margin, the lowest index among equals', () => {
    const cells = [cell(0, { overshootPercent: 9 }), cell(4, { overshootPercent: 2, settlingTime: 0.1 }), cell(5, { overshootPercent: 2, settlingTime: 0.1 }), cell(1, { stable: false, overshootPercent: null, settlingTime: null, steadyStateError: null })];
    const map = summarizeGainMap(base, plan, 'closed-form', [...cells, cell(2), cell(3)]);
    expect(Object.keys(map.metrics)).toEqual(['overshootPercent', 'settlingTime', 'steadyStateError', 'slowestPoleReal', 'stable']);
    expect(map.metrics.overshootPercent).toEqual([
      [9, null, 5],
      [5, 2, 2],
    ]);
    expect(map.meetsLimits).toEqual([
      [true, false, true],
      [true, true, true],
    ]);
    expect(map.suggested).toMatchObject({ index: 4, row: 1, col: 1, gains: { kp: 2, kd: 0.2 }, margin: expect.closeTo(0.8, 12), tightest: 'overshootPercent' });
    expect(map.statement).toBe('kp = 2, kd = 0.2 meets every limit with a margin of 80.0 % (tightest: overshootPercent)');
    expect(map.contours.map((c) => [c.metric, c.level, c.unit])).toEqual([
      ['overshootPercent', 10, '%'],
      ['settlingTime', 0.5, 's'],
      ['steadyStateError', 0.01, 'rad'],
    ]);
    expect(map.contours[2]!.values[0]).toEqual([0.001, null, 0.001]);
    expect(map.computed).toBe(6);
  });

  it('says plainly when no cell meets every limit, and how much of the map is in', () => {
    const map = summarizeGainMap(base, plan, 'sim', [cell(0, { overshootPercent: 30 }), cell(3, { settlingTime: 0.9 })]);
    expect(map.suggested).toBeNull();
    expect(map.statement).toBe('no cell of the map meets every limit (2 of 6 cells computed so far)');
    expect(map.metrics.superpositionPass).toEqual([
      [null, null, null],
      [null, null, null],
    ]);
    expect(map.meetsLimits[1]).toEqual([false, null, null]);
  });

  it('suggests nothing when the scenario sets no limits', () => {
    const free = { ...base, limits: { overshootPercent: null, settlingTime: null, steadyStateError: null } };
    const map = summarizeGainMap(free, plan, 'closed-form', [cell(0)]);
    expect(map.suggested).toBeNull();
    expect(map.contours).toEqual([]);
    expect(map.statement).toContain('sets no limits');
  });

  it('ignores cells outside the plan and repeats', () => {
    const map = summarizeGainMap(base, plan, 'closed-form', [cell(0, { overshootPercent: 1 }), cell(0, { overshootPercent: 7 }), cell(6), cell(-1)]);
    expect(map.computed).toBe(1);
    expect(map.metrics.overshootPercent![0]![0]).toBe(1);
  });

  it('is the same map whether the cells come in one chunk or several, in any order', () => {
    const whole = evaluateCells(base, plan, 'closed-form', allCells(plan.cells));
    const parts = [[4, 5], [0, 2], [3, 1]].map((chunk) => evaluateCells(base, plan, 'closed-form', chunk));
    if (!whole.ok || parts.some((p) => !p.ok)) throw new Error('refused');
    const seen: number[] = [];
    const fromParts = parts.flatMap((p) => (p.ok ? p.value : []));
    evaluateCells(base, plan, 'closed-form', [2, 0], (c) => seen.push(c.index));
    expect(seen).toEqual([2, 0]);
    expect(JSON.parse(JSON.stringify(summarizeGainMap(base, plan, 'closed-form', fromParts)))).toEqual(JSON.parse(JSON.stringify(summarizeGainMap(base, plan, 'closed-form', whole.value))));
  });
});

describe('evaluateCells input', () => {
  it('refuses indices outside the plan, an unknown method and a tampered plan, naming the field', () => {
    const bad = (r: ReturnType<typeof evaluateCells>) => (r.ok ? [] : r.errors);
    expect(bad(evaluateCells(base, plan, 'closed-form', [0, 6]))[0]).toMatchObject({ field: 'indices.1' });
    expect(bad(evaluateCells(base, plan, 'closed-form', [0.5]))[0]).toMatchObject({ field: 'indices.0' });
    expect(bad(evaluateCells(base, plan, 'fast' as 'sim', [0]))[0]).toMatchObject({ field: 'method' });
    expect(bad(evaluateCells(base, { ...plan, x: { ...plan.x, values: [1, Number.NaN, 3] } }, 'closed-form', [0]))[0]).toMatchObject({ field: 'plan.x.values.1' });
    const sampledNoise = { ...base, nonlinear: { ...base.nonlinear, noiseStdDev: 0.001 } };
    expect(bad(evaluateCells(sampledNoise, plan, 'sim', [0]))[0]).toMatchObject({ field: 'nonlinear.noiseStdDev' });
  });
});
