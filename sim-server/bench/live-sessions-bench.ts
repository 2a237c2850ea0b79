import { fork } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { io, type Socket } from 'socket.io-client';
import { RUN_NAMESPACE, type ClientToServerEvents, type RunStartRequest, type ServerToClientEvents } from '../../shared/protocol/run-events';
import type { ScenarioInput } from '../../shared/scenario/scenario-schema';
import { DEMO_ACCOUNTS } from '../db/seed-demo';
import { signIn } from '../testing/test-server';
import type { BenchResult } from './bench-result';

type Client = Socket<ServerToClientEvents, ClientToServerEvents>;

/** The limits a session count must keep to count as sustained. */
export const LIVE_BENCH_LIMITS = { loopDelayP99Ms: 20, lagS: 0.1, windowS: 4 } as const;

/** A 10 s PID scenario with a reference step and a torque disturbance (benchmark load, invented). */
const benchScenario: ScenarioInput = {
  kind: 'kinetwin/scenario',
  version: 1,
  name: 'bench load',
  joint: { inertia: 0.012, damping: 0.04, stiffness: 0 },
  controller: { mode: 'pid', kp: 6, ki: 4, kd: 0.35 },
  inputs: [
    { channel: 'reference', shape: 'step', amplitude: 0.5, delay: 0.1 },
    { channel: 'torque', shape: 'step', amplitude: -0.2, delay: 5 },
  ],
  horizon: 60,
};

interface Probe {
  p99Ms: number;
  maxMs: number;
  liveRuns: number;
}

/**
 * How many concurrent real-time live runs one server sustains on this machine: real socket.io
 * clients on loopback each run a scenario at ×1; a level is sustained when the server's
 * event-loop delay p99 stays under 20 ms and every client's stream keeps up with the wall clock.
 */
export async function benchLiveSessions(databaseUrl: string, levels = [25, 50, 100, 125, 150, 175, 200, 250, 300]): Promise<BenchResult[]> {
  const worker = fork(fileURLToPath(new URL('./live-server-process.ts', import.meta.url)), {
    execArgv: ['--import', 'tsx'],
    env: { ...process.env, DATABASE_URL: databaseUrl },
  });
  const next = (type: string) => new Promise<Record<string, unknown>>((resolve) => {
    const onMessage = (m: unknown) => {
      const message = m as Record<string, unknown>;
      if (message['type'] === type) {
        worker.off('message', onMessage);
        resolve(message);
      }
    };
    worker.on('message', onMessage);
  });
  const { baseUrl } = (await next('ready')) as { baseUrl: string };
  const cookie = await signIn(baseUrl, DEMO_ACCOUNTS[0]!.email, DEMO_ACCOUNTS[0]!.password);

  let sustained = 0;
  const rows: string[] = [];
  try {
    for (const count of levels) {
      const clients: Client[] = [];
      const lastT = new Float64Array(count);
      const startedAt = new Float64Array(count);
      await Promise.all(
        Array.from({ length: count }, (_, i) => new Promise<void>((resolve, reject) => {
          const client: Client = io(`${baseUrl}${RUN_NAMESPACE}`, { transports: ['websocket'], extraHeaders: { cookie }, reconnection: false, forceNew: true });
          clients.push(client);
          client.on('run:frame', (f) => (lastT[i] = f.t[f.t.length - 1]!));
          client.once('connect', () => {
            client.emit('run:start', { scenario: benchScenario, speed: 1 } as RunStartRequest, (ack) => {
              // The server starts the run's clock just before it acknowledges.
              startedAt[i] = performance.now();
              if (ack.status === 'ok') resolve();
              else reject(new Error(JSON.stringify(ack.errors)));
            });
          });
          client.once('connect_error', reject);
        })),
      );
      await new Promise((r) => setTimeout(r, 500));
      worker.send({ type: 'reset' });
      await next('reset');
      await new Promise((r) => setTimeout(r, LIVE_BENCH_LIMITS.windowS * 1000));
      worker.send({ type: 'read' });
      const probe = (await next('read')) as unknown as Probe;
      const now = performance.now();
      let worstLag = 0;
      for (let i = 0; i < count; i++) worstLag = Math.max(worstLag, (now - startedAt[i]!) / 1000 - lastT[i]!);
      clients.forEach((c) => c.disconnect());
      await new Promise((r) => setTimeout(r, 300));
      const ok = probe.p99Ms < LIVE_BENCH_LIMITS.loopDelayP99Ms && worstLag < LIVE_BENCH_LIMITS.lagS;
      rows.push(`${count} sessions: loop p99 ${probe.p99Ms.toFixed(1)} ms, worst stream lag ${(worstLag * 1000).toFixed(0)} ms ${ok ? 'ok' : 'NOT sustained'}`);
      if (!ok) break;
      sustained = count;
    }
  } finally {
    worker.send({ type: 'close' });
    await next('closed');
  }
  for (const row of rows) process.stdout.write(`  live sessions: ${row}\n`);
  return [{ name: 'concurrent real-time live runs sustained (loop p99 < 20 ms)', median: sustained, unit: 'sessions', runs: rows.length, goal: '≥ 100' }];
}
