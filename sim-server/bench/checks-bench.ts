import { monitorEventLoopDelay, performance } from 'node:perf_hooks';
import { slowWrist } from '../checks/testing/slow-wrist';
import { createTestTeam, demoScenarioDocument, startTestServer, type TestMember } from '../testing/test-server';
import type { BenchResult } from './bench-result';
import { median } from './bench-timing';

/** The time limit the stop figures run under, ms (the checks tests once asserted 2–4 s for it). */
const STOP_LIMIT_MS = 2000;

async function timedCheck(member: TestMember, scenario: unknown): Promise<{ status: number; ms: number }> {
  const started = performance.now();
  const res = await member.api.post('/api/checks', { scenario });
  await res.arrayBuffer();
  return { status: res.status, ms: performance.now() - started };
}

/**
 * The checks pool's timing figures, which the integration tests leave to ordering: how quickly
 * the server answers /api/health and how long its event loop stalls while a slow check holds a
 * worker; how soon past the time limit a runaway check answers 504; and how long the next check
 * takes when it must start a fresh worker thread. The server runs in this process, so the
 * histogram watches its event loop; run it on a quiet machine.
 */
export async function benchChecks(databaseUrl: string, stops = 3): Promise<BenchResult[]> {
  return [...(await benchResponsiveness(databaseUrl)), ...(await benchStops(databaseUrl, stops))];
}

/** Health probes and event-loop delay while a sampled 5 s check (about 2.3 s of work) holds the only worker. */
async function benchResponsiveness(databaseUrl: string): Promise<BenchResult[]> {
  const t = await startTestServer({ DATABASE_URL: databaseUrl, KINETWIN_CHECK_WORKERS: '1' });
  try {
    const member = (await createTestTeam(t, 'Bench checks lab')).members.engineer;
    // Warm-up: the first check starts the worker thread.
    await timedCheck(member, demoScenarioDocument());
    const loop = monitorEventLoopDelay({ resolution: 1 });
    loop.enable();
    let finished = false;
    const slow = timedCheck(member, slowWrist(5)).finally(() => (finished = true));
    const probes: number[] = [];
    while (!finished) {
      const started = performance.now();
      const res = await fetch(`${t.baseUrl}/api/health`);
      await res.arrayBuffer();
      if (!finished) probes.push(performance.now() - started);
    }
    loop.disable();
    const check = await slow;
    return [
      { name: `sampled 5 s check (answered ${check.status}), answer time`, median: check.ms, unit: 'ms', runs: 1 },
      { name: '/api/health while that check runs, median', median: median(probes), unit: 'ms', runs: probes.length },
      { name: '/api/health while that check runs, slowest', median: Math.max(...probes), unit: 'ms', runs: probes.length, goal: '< 250 ms' },
      { name: 'event-loop delay while that check runs, max', median: loop.max / 1e6, unit: 'ms', runs: 1, goal: '< 100 ms' },
    ];
  } finally {
    await t.close();
  }
}

/** A runaway check stopped at STOP_LIMIT_MS, then the next check on the fresh thread that replaces the stopped one. */
async function benchStops(databaseUrl: string, stops: number): Promise<BenchResult[]> {
  const t = await startTestServer({ DATABASE_URL: databaseUrl, KINETWIN_CHECK_WORKERS: '1', KINETWIN_CHECK_TIME_LIMIT_MS: String(STOP_LIMIT_MS) });
  try {
    const member = (await createTestTeam(t, 'Bench stops lab')).members.engineer;
    await timedCheck(member, demoScenarioDocument());
    const answers504: number[] = [];
    const nextAfterStop: number[] = [];
    for (let i = 0; i < stops; i++) {
      const stopped = await timedCheck(member, slowWrist(60));
      if (stopped.status === 504) answers504.push(stopped.ms);
      const next = await timedCheck(member, demoScenarioDocument());
      if (next.status === 200) nextAfterStop.push(next.ms);
    }
    return [
      { name: `504 for a runaway check past a ${STOP_LIMIT_MS / 1000} s limit, answer time`, median: median(answers504), unit: 'ms', runs: answers504.length, goal: '2000–4000 ms' },
      { name: 'next check after the stopped worker (a fresh thread)', median: median(nextAfterStop), unit: 'ms', runs: nextAfterStop.length },
    ];
  } finally {
    await t.close();
  }
}
