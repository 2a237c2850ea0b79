import { evaluateClosedForm, solveClosedForm } from '../../shared/closed-form';
import { parseScenario } from '../../shared/scenario/parse-scenario';
import type { Scenario, ScenarioInput } from '../../shared/scenario/scenario-schema';
import { simulateTwin, TWIN_DEFAULTS } from '../../shared/twin/twin-run';
import { createTwinSolver } from '../../shared/twin/twin-solver';
import type { BenchResult } from './bench-result';
import { medianAfterWarmUp } from './bench-timing';

/** Runs discarded before timing (JIT warm-up), and runs timed per figure. */
export const TWIN_BENCH_RUNS = { warmUp: 30, timed: 101 } as const;

const pidControl = { mode: 'pid', kp: 6, ki: 4, kd: 0.35, derivativeOn: 'measurement' } as const;

/** A 10 s PID scenario with a reference step and a torque disturbance (benchmark load, invented). */
const linearLoad: ScenarioInput = {
  kind: 'kinetwin/scenario',
  version: 1,
  name: 'twin bench, linear',
  joint: { inertia: 0.012, damping: 0.04, stiffness: 0 },
  controller: pidControl,
  inputs: [
    { channel: 'reference', shape: 'step', amplitude: 0.5, delay: 0.1 },
    { channel: 'torque', shape: 'step', amplitude: -0.2, delay: 5 },
  ],
  horizon: 10,
};

/** The same joint with the continuous-time effects on: limit, friction, gravity, dead band. */
const continuousEffects = {
  torqueLimit: 2,
  coulombFriction: 0.03,
  staticFriction: 0.05,
  gravity: { mass: 0.3, arm: 0.15, offset: Math.PI / 2 },
  deadBand: 0.01,
};

const nonlinearLoad: ScenarioInput = { ...linearLoad, name: 'twin bench, continuous effects', nonlinear: continuousEffects };

/** Every effect: a 1 ms sampled loop with a compute delay, a 4096-count encoder and noise too. */
const everyEffectLoad: ScenarioInput = {
  ...linearLoad,
  name: 'twin bench, every effect',
  controller: { ...pidControl, samplePeriod: 0.001 },
  nonlinear: { ...continuousEffects, computeDelay: true, encoderCounts: 4096, noiseStdDev: 2e-4, noiseSeed: 11 },
};

function parsed(input: ScenarioInput): Scenario {
  const result = parseScenario(input);
  if (!result.ok) throw new Error(`bench scenario "${input.name}" is invalid: ${JSON.stringify(result.errors)}`);
  return result.value;
}

const medianMs = (work: () => unknown) => medianAfterWarmUp(work, TWIN_BENCH_RUNS);

/** Restarts in a 10 s run of a 1 ms sampled loop: the twin restarts odex at every sample. */
const SAMPLED_RESTARTS = 10_000;

/**
 * The floor under a 1 ms sampled loop: 10,000 odex integrations, each over one 1 ms stretch of
 * the bench joint with gravity under a held torque, on the twin's own solver set-up (one odex 3
 * solver kept for the run, its tolerances and columns, the stretch as the first step) and
 * none of the twin's code; `whole` takes each stretch as one step where odex accepts it, as the
 * twin does.
 */
function bareRestarts(whole: boolean): () => void {
  const { inertia, damping } = linearLoad.joint;
  const weightMoment = 0.3 * 9.80665 * 0.15;
  let held = 0;
  const solver = createTwinSolver(
    (_t, y, rates) => {
      rates[0] = y[1]!;
      rates[1] = (held - damping * y[1]! - weightMoment * Math.cos(y[0]!)) / inertia;
    },
    2,
    TWIN_DEFAULTS,
    false,
  );
  return () => {
    let y = [0, 0];
    for (let k = 0; k < SAMPLED_RESTARTS; k++) {
      // A PD law on the sample keeps the joint moving the way a loop would.
      held = 6 * (0.5 - y[0]!) - 0.35 * y[1]!;
      const start = k * 0.001;
      const end = (k + 1) * 0.001;
      y = (whole ? solver.wholeStep(start, y, end) : null) ?? solver.stretch(start, y, end, 0.001, TWIN_DEFAULTS.maxStepsPerChunk).y;
    }
  };
}

/**
 * Twin benchmarks: median time of one 10 s PID run at 1 ms output, linear, with the continuous
 * effects on, and with every effect on; and the ratio of the linear twin's time to the closed
 * form's (solve and evaluate on the same 1 ms grid).
 */
export async function benchTwin(): Promise<BenchResult[]> {
  const runs = TWIN_BENCH_RUNS.timed;
  const linear = parsed(linearLoad);
  const results: BenchResult[] = [];
  const twinLinear = await medianMs(() => simulateTwin(linear, { dt: 0.001 }));
  results.push({ name: 'twin: 10 s PID run at 1 ms output, linear', median: twinLinear, unit: 'ms', runs, goal: '< 2 ms' });
  const continuous = parsed(nonlinearLoad);
  results.push({
    name: 'twin: 10 s PID run at 1 ms output, torque limit + friction + gravity + dead band (continuous loop)',
    median: await medianMs(() => simulateTwin(continuous, { dt: 0.001 })),
    unit: 'ms',
    runs,
  });
  const everything = parsed(everyEffectLoad);
  results.push({
    name: 'twin: 10 s PID run at 1 ms output, every effect on (1 ms sampled loop, compute delay, encoder, noise)',
    median: await medianMs(() => simulateTwin(everything, { dt: 0.001 })),
    unit: 'ms',
    runs,
    goal: '< 15 ms',
  });
  results.push({
    name: `bare odex 3: ${SAMPLED_RESTARTS.toLocaleString('en')} restarts over 1 ms stretches, no twin code, odex's own start (two steps a stretch)`,
    median: await medianMs(bareRestarts(false)),
    unit: 'ms',
    runs,
  });
  results.push({
    name: `bare odex 3: the same restarts, each stretch one step where odex accepts it (the floor under the 1 ms sampled loop)`,
    median: await medianMs(bareRestarts(true)),
    unit: 'ms',
    runs,
  });
  const closedForm = await medianMs(() => {
    const solved = solveClosedForm(linear);
    if (!solved.ok) throw new Error(`closed form refused the bench scenario: ${JSON.stringify(solved.errors)}`);
    evaluateClosedForm(solved.value, 0.001, linear.horizon);
  });
  results.push({ name: 'twin time / closed-form time, same linear 10 s scenario at 1 ms', median: twinLinear / closedForm, unit: '×', runs });
  return results;
}
