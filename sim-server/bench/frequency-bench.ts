import { DEFAULT_FREQUENCY_GRID, logFrequencies } from '../../shared/frequency/frequency-grid';
import { frequencyResponseOf } from '../../shared/frequency/frequency-response';
import { sineSweepOfTwin } from '../../shared/frequency/twin-sine-sweep';
import { parseScenario } from '../../shared/scenario/parse-scenario';
import { performance } from 'node:perf_hooks';
import { type BenchResult } from './bench-result';
import { median, timeRuns } from './bench-timing';
import { BENCH_SCENARIO } from './closed-form-bench';
import { createCheckPool } from '../checks/check-pool';
import { sweepOnPool } from '../checks/parallel-sweep';
import { createLogger } from '../logging/logger';

const WARM_UP_RUNS = 50;
const TIMED_RUNS = 500;

/**
 * Closed-form frequency response: median time for the default 200-point grid (0.1–1000 rad/s)
 * of the loop, both closed-loop paths, margins, bandwidth and the stability verdict, for the
 * closed-form bench's PID joint continuous, and sampled at 1 ms with a compute delay (where the
 * verdict comes from the Nyquist count instead of the poles).
 */
export async function benchFrequency(): Promise<BenchResult[]> {
  const sampledScenario = { ...BENCH_SCENARIO, controller: { ...BENCH_SCENARIO.controller, samplePeriod: 0.001 }, nonlinear: { computeDelay: true } };
  const results: BenchResult[] = [];
  for (const [label, input] of [
    ['continuous PID', BENCH_SCENARIO],
    ['PID sampled at 1 ms with compute delay', sampledScenario],
  ] as const) {
    const parsed = parseScenario(input);
    if (!parsed.ok) throw new Error(`bench scenario is invalid: ${JSON.stringify(parsed.errors)}`);
    let sink = 0;
    const times = timeRuns(
      () => {
        const r = frequencyResponseOf(parsed.value, DEFAULT_FREQUENCY_GRID);
        if (r.ok) sink += r.value.margins.phaseMarginDeg ?? 0;
      },
      WARM_UP_RUNS,
      TIMED_RUNS,
    );
    if (!Number.isFinite(sink)) throw new Error('frequency bench produced a non-finite margin');
    results.push({ name: `frequency response: ${DEFAULT_FREQUENCY_GRID.points} points with margins, ${label}`, median: median(times), unit: 'ms', runs: TIMED_RUNS, goal: '< 2 ms' });
  }
  results.push(benchSineSweep());
  results.push(await benchSineSweepOnPool());
  return results;
}

const SWEEP_RUNS = 5;

/**
 * The twin's measured response: 20 log-spaced frequencies from 1 to 1000 rad/s on the
 * reference path of the continuous bench joint, each a twin run past the transient plus four
 * measured periods, in one thread (the sweep's runs are independent; on a worker pool of two
 * threads it would take about half).
 */
function benchSineSweep(): BenchResult {
  const parsed = parseScenario(BENCH_SCENARIO);
  const grid = logFrequencies({ from: 1, to: 1000, points: 20 });
  if (!parsed.ok || !grid.ok) throw new Error('sweep bench inputs are invalid');
  const times = timeRuns(
    () => {
      const r = sineSweepOfTwin(parsed.value, { frequencies: grid.value, channel: 'reference', amplitude: 0.1 });
      if (!r.ok || r.value.points.some((p) => p.reason !== null)) throw new Error('sweep bench: a frequency was not measured');
    },
    1,
    SWEEP_RUNS,
  );
  return { name: 'twin sine sweep: 20 frequencies 1–1000 rad/s, one thread', median: median(times), unit: 'ms', runs: SWEEP_RUNS, goal: '< 2 s on both cores' };
}

/**
 * The same 20-frequency sweep as the server answers it: dealt over a pool of two worker threads
 * (the route's sweepOnPool), threads started and warmed by one untimed sweep first.
 */
async function benchSineSweepOnPool(): Promise<BenchResult> {
  const parsed = parseScenario(BENCH_SCENARIO);
  if (!parsed.ok) throw new Error('sweep bench scenario is invalid');
  const pool = createCheckPool({ workers: 2, queueSize: 8, timeLimitMs: 120_000, logger: createLogger('silent') });
  const request = { scenario: parsed.value, from: 1, to: 1000, points: 20, channel: 'reference' as const, amplitude: 0.1 };
  try {
    await sweepOnPool(pool, request);
    const times: number[] = [];
    for (let i = 0; i < SWEEP_RUNS; i++) {
      const t0 = performance.now();
      const r = await sweepOnPool(pool, request);
      times.push(performance.now() - t0);
      if ('errors' in r || r.points.some((p) => p.reason !== null)) throw new Error('pool sweep bench: a frequency was not measured');
    }
    return { name: 'twin sine sweep: the same on the server pool, two worker threads', median: median(times), unit: 'ms', runs: SWEEP_RUNS, goal: '< 2 s on both cores' };
  } finally {
    await pool.close();
  }
}
