import { parseScenario } from '../../shared/scenario/parse-scenario';
import { type Scenario } from '../../shared/scenario/scenario-schema';
import { compileResponsePlan, evaluateUniformGrid, invertScenario, solveClosedForm } from '../../shared/closed-form/index';
import { type BenchResult } from './bench-result';
import { median, timeRuns } from './bench-timing';

/** The benchmark scenario: a geared PID joint with a filtered derivative and four input terms, two delayed (invented demo values). */
export const BENCH_SCENARIO = {
  kind: 'kinetwin/scenario',
  version: 1,
  name: 'bench: PID joint, four input terms',
  joint: { inertia: 0.012, damping: 0.004, stiffness: 0.05, gearRatio: 50 },
  controller: { mode: 'pid', kp: 0.4, ki: 0.6, kd: 0.012, derivativeOn: 'error', derivativeFilter: 0.002 },
  initial: { angle: 0.02, velocity: 0 },
  inputs: [
    { channel: 'reference', shape: 'step', amplitude: 0.5 },
    { channel: 'torque', shape: 'step', amplitude: -0.8, delay: 0.6 },
    { channel: 'reference', shape: 'ramp', amplitude: 0.2 },
    { channel: 'torque', shape: 'sine', amplitude: 0.15, frequency: 12, delay: 1.2 },
  ],
  horizon: 2,
} as const;

/** Grid size of the evaluation figure: 10,001 points of angle and velocity (0 … 2 s at 0.2 ms). */
export const BENCH_GRID_POINTS = 10_001;
const WARM_UP_RUNS = 200;
const TIMED_RUNS = 2000;
const EVAL_WARM_UP_RUNS = 50;
const EVAL_TIMED_RUNS = 400;

/**
 * Closed-form benchmark: median time to build and invert the four-term PID scenario (transfer
 * functions, roots, partial fractions, compiled evaluator), median time of the full solve
 * (plus theorems, step metrics, LaTeX), and the evaluation rate of 10,001 grid points of angle
 * and velocity.
 */
export async function benchClosedForm(): Promise<BenchResult[]> {
  const parsed = parseScenario(BENCH_SCENARIO);
  if (!parsed.ok) throw new Error(`bench scenario is invalid: ${JSON.stringify(parsed.errors)}`);
  const scenario: Scenario = parsed.value;
  let sink = 0;
  const invertTimes = timeRuns(
    () => {
      const inverted = invertScenario(scenario);
      if (!inverted.ok) throw new Error(JSON.stringify(inverted.errors));
      sink += compileResponsePlan(inverted.value.pieces).groupRe.length;
    },
    WARM_UP_RUNS,
    TIMED_RUNS,
  );
  const solveTimes = timeRuns(
    () => {
      const solved = solveClosedForm(scenario);
      if (!solved.ok) throw new Error(JSON.stringify(solved.errors));
      sink += solved.value.poles.length;
    },
    20,
    200,
  );
  const solved = solveClosedForm(scenario);
  if (!solved.ok) throw new Error(JSON.stringify(solved.errors));
  const plan = solved.value.plan;
  const angle = new Float64Array(BENCH_GRID_POINTS);
  const velocity = new Float64Array(BENCH_GRID_POINTS);
  const dt = scenario.horizon / (BENCH_GRID_POINTS - 1);
  const evalTimes = timeRuns(
    () => {
      evaluateUniformGrid(plan, dt, BENCH_GRID_POINTS, angle, velocity);
      sink += angle[BENCH_GRID_POINTS - 1]!;
    },
    EVAL_WARM_UP_RUNS,
    EVAL_TIMED_RUNS,
  );
  // Keep the results observable so the optimiser cannot drop the work.
  if (!Number.isFinite(sink)) throw new Error('benchmark produced a non-finite result');
  const evalMedianMs = median(evalTimes);
  return [
    { name: 'closed form: build + invert (PID, 4 input terms, 2 delayed)', median: median(invertTimes) * 1000, unit: 'µs', runs: TIMED_RUNS, goal: '< 100 µs' },
    { name: 'closed form: full solve incl. theorems, step metrics, LaTeX', median: median(solveTimes) * 1000, unit: 'µs', runs: 200 },
    { name: `closed form: evaluate ${BENCH_GRID_POINTS} points (angle + velocity)`, median: evalMedianMs * 1000, unit: 'µs', runs: EVAL_TIMED_RUNS },
    { name: 'closed form: evaluation rate', median: BENCH_GRID_POINTS / (evalMedianMs / 1000), unit: 'points/s', runs: EVAL_TIMED_RUNS, goal: '> 20,000,000 points/s' },
  ];
}
