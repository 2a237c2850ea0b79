import { monitorEventLoopDelay } from 'node:perf_hooks';
import { startTestServer } from '../testing/test-server';

/**
 * The live-run server for the concurrency benchmark, in its own process (forked with an IPC
 * channel), so the clients driving it do not distort its event-loop delay.
 */
const databaseUrl = process.env['DATABASE_URL']!;
const send = (message: object) => process.send!(message);
const server = await startTestServer({ DATABASE_URL: databaseUrl, MAX_LIVE_RUNS: '100000' });
const histogram = monitorEventLoopDelay({ resolution: 1 });
histogram.enable();

process.on('message', async (message: { type: 'reset' | 'read' | 'close' }) => {
  if (message.type === 'reset') {
    histogram.reset();
    send({ type: 'reset' });
  } else if (message.type === 'read') {
    send({
      type: 'read',
      p99Ms: histogram.percentile(99) / 1e6,
      maxMs: histogram.max / 1e6,
      liveRuns: server.server.liveRuns(),
    });
  } else {
    histogram.disable();
    await server.close();
    send({ type: 'closed' });
    process.disconnect();
  }
});
send({ type: 'ready', baseUrl: server.baseUrl });
