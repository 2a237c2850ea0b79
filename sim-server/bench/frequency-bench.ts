import { DEFAULT_FREQUENCY_GRID } from '../../shared/frequency/frequency-grid';
import { frequencyResponseOf } from '../../shared/frequency/frequency-response';
import { parseScenario } from '../../shared/scenario/parse-scenario';
import { type BenchResult } from './bench-result';
import { median, timeRuns } from './bench-timing';
import { BENCH_SCENARIO } from './closed-form-bench';

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
  return results;
}
