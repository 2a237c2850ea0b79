import { monitorEventLoopDelay, performance } from 'node:perf_hooks';
import { setTimeout as delay } from 'node:timers/promises';
import { parseScenario } from '../../shared/scenario/parse-scenario';
import type { Scenario, ScenarioInput } from '../../shared/scenario/scenario-schema';
import { startLiveRun, LIVE_SLICE_MS } from '../runs/live-run';
import type { BenchResult } from './bench-result';

/** Runs per figure: the sliced runs are cheap to repeat, the unsliced ones hold the loop for seconds. */
export const STIFF_BENCH_RUNS = { sliced: 5, unsliced: 3 } as const;

/**
 * The worst in-range stiff run found for issue 9 (the same as run-freeze.int.spec.ts): the
 * largest kd the catalogue allows on a 1 g·m² joint, a 1 µs sampled loop and friction. It grinds
 * until one of the twin's bounds stops it: the work budget, or (since a sample of the loop costs
 * less) the friction-event bound, stick/slip switching every few samples.
 */
const stiffLoad: ScenarioInput = {
  kind: 'kinetwin/scenario',
  version: 1,
  name: 'stiff run bench',
  joint: { inertia: 1e-3, damping: 0.08, stiffness: 0 },
  controller: { mode: 'pid', kp: 10, ki: 2, kd: 1e7, derivativeOn: 'measurement', samplePeriod: 1e-6 },
  inputs: [{ channel: 'reference', shape: 'step', amplitude: 0.8, delay: 0.2 }],
  horizon: 3,
  nonlinear: { torqueLimit: 1.5, coulombFriction: 0.05, staticFriction: 0.08 },
};

function parsed(input: ScenarioInput): Scenario {
  const result = parseScenario(input);
  if (!result.ok) throw new Error(`bench scenario "${input.name}" is invalid: ${JSON.stringify(result.errors)}`);
  return result.value;
}

function median(xs: number[]): number {
  const sorted = [...xs].sort((a, b) => a - b);
  const mid = Math.floor(sorted.length / 2);
  return sorted.length % 2 ? sorted[mid]! : (sorted[mid - 1]! + sorted[mid]!) / 2;
}

/**
 * One live run of the stiff load at "as fast as possible", in this process: the longest event-loop
 * block while it computed (perf_hooks' delay histogram at 1 ms resolution, and the longest gap a
 * 1 ms timer saw), the most CPU time spent between two turns of that timer, and the wall time
 * until it ended.
 */
async function oneRun(scenario: Scenario, sliceMs: number | null): Promise<{ blockMs: number; gapMs: number; cpuMs: number; wallMs: number; reason: string; message: string }> {
  const loop = monitorEventLoopDelay({ resolution: 1 });
  let last = performance.now();
  let lastCpu = process.cpuUsage();
  let gap = 0;
  let cpu = 0;
  // The CPU time the process spent in each gap tells computing from the machine's other load
  // (a gap with little CPU in it is this process waiting for a core, not the event loop busy).
  const probe = setInterval(() => {
    const now = performance.now();
    const used = process.cpuUsage(lastCpu);
    gap = Math.max(gap, now - last);
    cpu = Math.max(cpu, (used.user + used.system) / 1000);
    last = now;
    lastCpu = process.cpuUsage();
  }, 1);
  loop.enable();
  const started = performance.now();
  const end = await new Promise<{ reason: string; message: string }>((resolve) => {
    startLiveRun('bench', scenario, { speed: 0, dt: 0.001, sliceMs }, { frame: () => undefined, end: (e) => resolve(e) });
  });
  const wallMs = performance.now() - started;
  // Both probes record a block only when they run after it: give them their turn before reading.
  await delay(20);
  loop.disable();
  clearInterval(probe);
  return { blockMs: loop.max / 1e6, gapMs: gap, cpuMs: cpu, wallMs, reason: end.reason, message: end.message };
}

/**
 * Longest event-loop block during the worst in-range stiff live run, median and worst over several
 * runs, with the live run's slicing (after) and with it off, each tick computing to its target
 * as before issue 9 (before); and the wall time until a bound stopped the run.
 */
export async function benchStiffRun(): Promise<BenchResult[]> {
  const scenario = parsed(stiffLoad);
  const results: BenchResult[] = [];
  for (const [label, sliceMs, runs] of [
    [`sliced (${LIVE_SLICE_MS} ms)`, LIVE_SLICE_MS, STIFF_BENCH_RUNS.sliced],
    ['unsliced (before)', null, STIFF_BENCH_RUNS.unsliced],
  ] as const) {
    const measured = [];
    for (let i = 0; i < runs; i++) {
      const run = await oneRun(scenario, sliceMs);
      if (run.reason !== 'bound' || !/^(work budget|friction event bound)/.test(run.message)) throw new Error(`stiff bench run ended otherwise: ${run.reason}: ${run.message}`);
      measured.push(run);
    }
    const blocks = measured.map((r) => Math.max(r.blockMs, r.gapMs));
    results.push({ name: `stiff live run, ${label}: longest event-loop block, median`, median: median(blocks), unit: 'ms', runs, goal: sliceMs === null ? undefined : '< 100 ms' });
    results.push({ name: `stiff live run, ${label}: longest event-loop block, worst run`, median: Math.max(...blocks), unit: 'ms', runs });
    results.push({ name: `stiff live run, ${label}: most CPU time spent between two 1 ms timer turns, median`, median: median(measured.map((r) => r.cpuMs)), unit: 'ms', runs });
    results.push({ name: `stiff live run, ${label}: wall time until a bound stopped it (work budget or friction events)`, median: median(measured.map((r) => r.wallMs)), unit: 'ms', runs });
  }
  return results;
}
