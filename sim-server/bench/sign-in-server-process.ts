import { subscribe } from 'node:diagnostics_channel';
import { monitorEventLoopDelay } from 'node:perf_hooks';
import { PASSWORD_WORK_CHANNEL } from '../auth/passwords';
import { startTestServer } from '../testing/test-server';

/**
 * The server for the sign-in benchmark, in its own process (forked with an IPC channel), so the
 * clients firing sign-ins do not distort its event loop. Forwarded addresses are believed from
 * loopback, so the bench can speak for many clients; every limit keeps its default.
 */
const send = (message: object) => process.send!(message);
const server = await startTestServer({ DATABASE_URL: process.env['DATABASE_URL']!, TRUST_PROXY: 'loopback' });
const histogram = monitorEventLoopDelay({ resolution: 1 });
histogram.enable();
let derivations = 0;
subscribe(PASSWORD_WORK_CHANNEL, () => derivations++);

process.on('message', async (message: { type: 'reset' | 'read' | 'close' }) => {
  if (message.type === 'reset') {
    histogram.reset();
    derivations = 0;
    send({ type: 'reset' });
  } else if (message.type === 'read') {
    send({ type: 'read', p99Ms: histogram.percentile(99) / 1e6, maxMs: histogram.max / 1e6, derivations, hashConcurrency: server.config.passwordHashConcurrency, addressLimit: server.config.signInAddressLimit });
  } else {
    histogram.disable();
    await server.close();
    send({ type: 'closed' });
    process.disconnect();
  }
});
send({ type: 'ready', baseUrl: server.baseUrl });
