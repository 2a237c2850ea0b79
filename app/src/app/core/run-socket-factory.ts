import { InjectionToken } from '@angular/core';
import { type ClientToServerEvents, RUN_NAMESPACE, type ServerToClientEvents } from '@kinetwin/shared/protocol/run-events';
import { type Socket, io } from 'socket.io-client';

/** The typed socket.io client of the live-run namespace. */
export type RunSocketClient = Socket<ServerToClientEvents, ClientToServerEvents>;

/**
 * Opens the live-run socket. The seam between RunSocket and socket.io: tests provide a factory
 * that returns a fake socket. Same origin, so the session cookie travels with the handshake;
 * reconnection is socket.io's default.
 */
export const RUN_SOCKET_FACTORY = new InjectionToken<() => RunSocketClient>('RUN_SOCKET_FACTORY', {
  providedIn: 'root',
  factory: () => () => io(RUN_NAMESPACE, { withCredentials: true }),
});
