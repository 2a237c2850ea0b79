import { fitTwin } from '../../shared/calibration/fit-twin';
import { multisineSignal, staircaseSignal, synthesizeTrace } from '../../shared/calibration/testing/synthetic-log';
import { parseScenario } from '../../shared/scenario/parse-scenario';
import type { RecordedSamples } from '../../shared/twin/recorded-samples';
import { withRecordings } from '../../shared/twin/recorded-samples';
import type { BenchResult } from './bench-result';
import { medianAfterWarmUp } from './bench-timing';

/** Fits timed per figure, after one untimed fit (JIT warm-up). */
export const FIT_BENCH_RUNS = { warmUp: 1, timed: 5 } as const;

const SECONDS = 10;
const RATE = 1000;

/** The bench joint, open loop under its logged torque (benchmark load, invented). */
const truth = { inertia: 0.05, damping: 0.3, stiffness: 2 };
/** The fit's start: every parameter well off (the scenario an engineer would begin from). */
const startJoint = { inertia: 0.07, damping: 0.2, stiffness: 2.6 };

function fitLoad(signal: RecordedSamples) {
  const parsed = parseScenario({
    kind: 'kinetwin/scenario',
    version: 1,
    name: 'fit bench',
    joint: truth,
    controller: { mode: 'open-loop' },
    horizon: SECONDS,
    recordedInputs: [{ channel: 'torque', logId: 'bench', signal: 'torque' }],
  });
  if (!parsed.ok) throw new Error(`fit bench scenario is invalid: ${JSON.stringify(parsed.errors)}`);
  const attached = withRecordings(parsed.value, () => signal);
  if (!attached.ok) throw new Error(`fit bench log is invalid: ${JSON.stringify(attached.errors)}`);
  const measured = synthesizeTrace(attached.value, RATE, 1e-4, null, 9);
  const scenario = { ...attached.value, joint: { ...attached.value.joint, ...startJoint } };
  return () => {
    const report = fitTwin({ scenario, measured, parameters: ['inertia', 'damping', 'stiffness'], initialState: 'scenario' });
    if (!report.ok || report.value.status !== 'converged') throw new Error(`the fit bench did not converge: ${JSON.stringify(report.ok ? report.value.warnings : report.errors)}`);
    return report.value;
  };
}

const medianMs = (work: () => unknown) => medianAfterWarmUp(work, FIT_BENCH_RUNS);

/**
 * Fit benchmarks: inertia, damping and stiffness fitted to a 10 s log at 1 kHz (10,001 angle
 * samples, seeded noise), under two logged torques: a staircase holding each level 50 ms (200
 * edges, the twin restarts at each), and a multisine that changes at every sample (10,000 edges:
 * the twin restarts every millisecond, like a 1 ms sampled loop).
 */
export async function benchFit(): Promise<BenchResult[]> {
  const runs = FIT_BENCH_RUNS.timed;
  const staircase = fitLoad(staircaseSignal(SECONDS, RATE, 0.05, 0.5, 3));
  const multisine = fitLoad(multisineSignal(SECONDS, RATE, 0.5, [2, 5, 11, 23]));
  const twinRuns = (fit: () => { evaluations: number; iterations: number }) => {
    const r = fit();
    return `${r.iterations} iterations, ${r.evaluations} twin runs`;
  };
  const stairNote = twinRuns(staircase);
  const multiNote = twinRuns(multisine);
  return [
    { name: `fit of inertia, damping, stiffness to a 10 s log at 1 kHz, torque staircase (50 ms levels; ${stairNote})`, median: await medianMs(staircase), unit: 'ms', runs, goal: '< 1000 ms' },
    { name: `the same, logged torque changing at every sample (${multiNote})`, median: await medianMs(multisine), unit: 'ms', runs, goal: '< 1000 ms' },
  ];
}
