import { performance } from 'node:perf_hooks';
import { evaluateCells } from '../../shared/gain-map/evaluate-cells';
import { planGainMap, type GainMapPlan } from '../../shared/gain-map/gain-map-plan';
import type { GainMapRequest } from '../../shared/gain-map/gain-map-request';
import { summarizeGainMap } from '../../shared/gain-map/gain-map-result';
import type { GainMapMethod } from '../../shared/gain-map/cell-metrics';
import { parseScenario } from '../../shared/scenario/parse-scenario';
import type { Scenario, ScenarioInput } from '../../shared/scenario/scenario-schema';
import type { BenchResult } from './bench-result';
import { median } from './bench-timing';

/** A geared-down wrist joint with a PID loop, a reference step and the three limits (benchmark load, invented). */
const wrist: ScenarioInput = {
  kind: 'kinetwin/scenario',
  version: 1,
  name: 'gain map bench: wrist PID',
  joint: { inertia: 0.012, damping: 0.04, stiffness: 0 },
  controller: { mode: 'pid', kp: 6, ki: 1, kd: 0.4, derivativeOn: 'measurement' },
  inputs: [{ channel: 'reference', shape: 'step', amplitude: 0.5, delay: 0.1 }],
  horizon: 2,
  limits: { overshootPercent: 10, settlingTime: 0.6, steadyStateError: 0.001 },
};

/** The same joint driven through a 1.5 N·m torque limit with anti-windup, over 3 s. */
const limited: ScenarioInput = { ...wrist, name: 'gain map bench: wrist PID, torque limit', horizon: 3, nonlinear: { torqueLimit: 1.5, antiWindup: true } };

const CLOSED_FORM_MAP: GainMapRequest = { x: { gain: 'kp', min: 0, max: 50, count: 100 }, y: { gain: 'kd', min: 0.01, max: 1, count: 100, spacing: 'log' } };
const TWIN_MAP: GainMapRequest = { x: { gain: 'kp', min: 1, max: 50, count: 6 }, y: { gain: 'kd', min: 0.05, max: 1, count: 6, spacing: 'log' } };
const CLOSED_FORM_RUNS = { warmUp: 1, timed: 5 } as const;
const TWIN_RUNS = { warmUp: 1, timed: 3 } as const;

function prepared(input: ScenarioInput, request: GainMapRequest): { scenario: Scenario; plan: GainMapPlan } {
  const parsed = parseScenario(input);
  if (!parsed.ok) throw new Error(`bench scenario "${input.name}" is invalid: ${JSON.stringify(parsed.errors)}`);
  const plan = planGainMap(parsed.value, request);
  if (!plan.ok) throw new Error(`bench map refused: ${JSON.stringify(plan.errors)}`);
  return { scenario: parsed.value, plan: plan.value };
}

/**
 * Wall and CPU time, ms, of evaluating every cell of the map in this thread and summarising it.
 * The CPU time is this process's user + system time over the run: on a shared machine it is the
 * work itself, where the wall time also holds the time spent waiting for a core.
 */
function timeMap(scenario: Scenario, plan: GainMapPlan, method: GainMapMethod): { wall: number; cpu: number } {
  const indices = Array.from({ length: plan.cells }, (_, i) => i);
  const cpu0 = process.cpuUsage();
  const start = performance.now();
  const cells = evaluateCells(scenario, plan, method, indices);
  if (!cells.ok) throw new Error(`bench map refused: ${JSON.stringify(cells.errors)}`);
  const map = summarizeGainMap(scenario, plan, method, cells.value);
  const wall = performance.now() - start;
  const cpu = process.cpuUsage(cpu0);
  if (map.computed !== plan.cells) throw new Error('bench map lost cells');
  return { wall, cpu: (cpu.user + cpu.system) / 1000 };
}

function medianOf(runs: { warmUp: number; timed: number }, work: () => { wall: number; cpu: number }): { wall: number; cpu: number } {
  for (let i = 0; i < runs.warmUp; i++) work();
  const timed = Array.from({ length: runs.timed }, work);
  return { wall: median(timed.map((t) => t.wall)), cpu: median(timed.map((t) => t.cpu)) };
}

/**
 * Gain map benchmarks, one thread (the job engine deals chunks over its workers): a 100 × 100
 * closed-form map of the wrist PID (kp linear, kd log), and the twin's cells per second on a
 * 6 × 6 map with the torque limit on (each cell: the step run, the whole-scenario run when it
 * differs, and the superposition check's four runs).
 */
export async function benchGainMap(): Promise<BenchResult[]> {
  const form = prepared(wrist, CLOSED_FORM_MAP);
  const formMs = medianOf(CLOSED_FORM_RUNS, () => timeMap(form.scenario, form.plan, 'closed-form'));
  const twin = prepared(limited, TWIN_MAP);
  const twinMs = medianOf(TWIN_RUNS, () => timeMap(twin.scenario, twin.plan, 'sim'));
  return [
    { name: 'gain map: 100 × 100 closed-form map (PID, kp × kd), one thread, wall time', median: formMs.wall / 1000, unit: 's', runs: CLOSED_FORM_RUNS.timed, goal: '< 1 s' },
    { name: 'gain map: the same, CPU time of this process', median: formMs.cpu / 1000, unit: 's', runs: CLOSED_FORM_RUNS.timed },
    { name: 'gain map: closed-form cells per second, one thread (wall time)', median: form.plan.cells / (formMs.wall / 1000), unit: 'cells/s', runs: CLOSED_FORM_RUNS.timed },
    { name: 'gain map: twin cells per second, torque limit on, 6 × 6 map, one thread (wall time)', median: twin.plan.cells / (twinMs.wall / 1000), unit: 'cells/s', runs: TWIN_RUNS.timed },
    { name: 'gain map: the same by CPU time of this process', median: twin.plan.cells / (twinMs.cpu / 1000), unit: 'cells/s', runs: TWIN_RUNS.timed },
  ];
}
