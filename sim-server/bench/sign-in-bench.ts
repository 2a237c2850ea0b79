import { fork } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { fileURLToPath } from 'node:url';
import type { BenchResult } from './bench-result';

/** Concurrent failed sign-ins per load, as in the probe of issue 16 §5. */
export const SIGN_IN_BURST = 100;
/** Pause between two health probes of the poller, ms (each probe waits for the previous answer). */
const HEALTH_PAUSE_MS = 10;

interface ServerRead {
  p99Ms: number;
  maxMs: number;
  derivations: number;
  hashConcurrency: number;
  addressLimit: number;
}

function percentile(values: number[], p: number): number {
  const sorted = values.slice().sort((a, b) => a - b);
  return sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))] ?? NaN;
}

async function healthMs(baseUrl: string): Promise<number> {
  const start = performance.now();
  const res = await fetch(`${baseUrl}/api/health`);
  await res.arrayBuffer();
  if (res.status !== 200) throw new Error(`health answered ${res.status}`);
  return performance.now() - start;
}

/**
 * Sign-in under load: /api/health latency, polled back to back, while 100 concurrent failed
 * sign-ins are hashed (100 unknown e-mails, each from its own forwarded address so that none is
 * refused before hashing), and then how many of 100 failed sign-ins from ONE address (100
 * e-mails) the per-address cap refuses. The server runs in its own process with default limits.
 */
export async function benchSignIn(databaseUrl: string): Promise<BenchResult[]> {
  const worker = fork(fileURLToPath(new URL('./sign-in-server-process.ts', import.meta.url)), {
    execArgv: ['--import', 'tsx'],
    env: { ...process.env, DATABASE_URL: databaseUrl },
  });
  const next = (type: string) =>
    new Promise<Record<string, unknown>>((resolve) => {
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
  const stamp = randomBytes(4).toString('hex');
  const signIn = (email: string, address: string) =>
    fetch(`${baseUrl}/api/auth/sign-in`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', 'x-forwarded-for': address },
      body: JSON.stringify({ email, password: 'not-the-password' }),
    }).then(async (res) => (await res.arrayBuffer(), res.status));

  /** Fires the burst and polls health until every sign-in has answered. */
  const underLoad = async (burst: () => Promise<number>[]) => {
    worker.send({ type: 'reset' });
    await next('reset');
    const started = performance.now();
    let done = false;
    const statuses = Promise.all(burst()).finally(() => (done = true));
    const health: number[] = [];
    while (!done) {
      health.push(await healthMs(baseUrl));
      await new Promise((r) => setTimeout(r, HEALTH_PAUSE_MS));
    }
    const answered = await statuses;
    const seconds = (performance.now() - started) / 1000;
    worker.send({ type: 'read' });
    const server = (await next('read')) as unknown as ServerRead;
    return { health, answered, seconds, server };
  };

  try {
    for (let i = 0; i < 20; i++) await healthMs(baseUrl);
    const idle: number[] = [];
    for (let i = 0; i < 50; i++) idle.push(await healthMs(baseUrl));
    // Warm the hashing path once (first scrypt, first queries) outside the measured window.
    await signIn(`warm-${stamp}@bench.example.test`, '10.250.0.1');

    const spread = await underLoad(() => Array.from({ length: SIGN_IN_BURST }, (_, i) => signIn(`spread-${stamp}-${i}@bench.example.test`, `10.251.${i >> 8}.${i & 255}`)));
    const oneAddress = `10.252.${randomBytes(1)[0]}.${randomBytes(1)[0]}`;
    const single = await underLoad(() => Array.from({ length: SIGN_IN_BURST }, (_, i) => signIn(`single-${stamp}-${i}@bench.example.test`, oneAddress)));

    const refused = single.answered.filter((s) => s === 429).length;
    const rows = [
      `idle health p50 ${percentile(idle, 50).toFixed(1)} ms`,
      `100 sign-ins from 100 addresses: ${spread.answered.filter((s) => s === 401).length} answered 401 in ${spread.seconds.toFixed(1)} s, ${spread.server.derivations} derivations (${spread.server.hashConcurrency} at once); health p50 ${percentile(spread.health, 50).toFixed(1)} ms, p95 ${percentile(spread.health, 95).toFixed(1)} ms, max ${Math.max(...spread.health).toFixed(1)} ms over ${spread.health.length} probes; server loop delay p99 ${spread.server.p99Ms.toFixed(1)} ms, max ${spread.server.maxMs.toFixed(1)} ms`,
      `100 sign-ins from one address: ${refused} refused (429) of 100, ${single.server.derivations} derivations (address cap ${single.server.addressLimit}); health p50 ${percentile(single.health, 50).toFixed(1)} ms`,
    ];
    for (const row of rows) process.stdout.write(`  sign-in: ${row}\n`);
    return [
      { name: `/api/health p50 while ${SIGN_IN_BURST} failed sign-ins hash (scrypt)`, median: percentile(spread.health, 50), unit: 'ms', runs: spread.health.length, goal: '< 50 ms' },
      { name: `/api/health p95 while ${SIGN_IN_BURST} failed sign-ins hash`, median: percentile(spread.health, 95), unit: 'ms', runs: spread.health.length },
      { name: `${SIGN_IN_BURST} concurrent failed sign-ins, all answered`, median: spread.seconds, unit: 's', runs: 1 },
      { name: `failed sign-ins refused of ${SIGN_IN_BURST} from one address (100 e-mails)`, median: refused, unit: 'refused', runs: 1, goal: `${SIGN_IN_BURST - single.server.addressLimit} (cap ${single.server.addressLimit})` },
    ];
  } finally {
    worker.send({ type: 'close' });
    await next('closed');
  }
}
