import { io, type Socket } from 'socket.io-client';
import type { Ack } from '../../shared/protocol/ack';
import { RUN_NAMESPACE, type ClientToServerEvents, type ServerToClientEvents } from '../../shared/protocol/run-events';

export type RunClient = Socket<ServerToClientEvents, ClientToServerEvents>;
type Emit = (event: string, ...args: unknown[]) => void;

/**
 * Real socket.io clients of the /runs namespace for one signed-in session, for tests that send
 * events by any name and payload (including ones the typed events do not allow).
 */
export function runSockets(baseUrl: () => string, cookie: () => string) {
  const clients: RunClient[] = [];
  return {
    connect: () =>
      new Promise<RunClient>((resolve, reject) => {
        const client: RunClient = io(`${baseUrl()}${RUN_NAMESPACE}`, { transports: ['websocket'], extraHeaders: { cookie: cookie() }, reconnection: false });
        clients.push(client);
        client.once('connect', () => resolve(client));
        client.once('connect_error', reject);
      }),
    /** Emits `args` and resolves with the acknowledgement, which socket.io always passes last. */
    ask: (client: RunClient, event: string, ...args: unknown[]) => new Promise<Ack<unknown>>((resolve) => (client.emit as Emit)(event, ...args, resolve)),
    /** Sends without asking for an answer. */
    tell: (client: RunClient, event: string, ...args: unknown[]) => (client.emit as Emit)(event, ...args),
    disconnectAll: () => clients.forEach((c) => c.disconnect()),
  };
}
