import type { Socket } from 'socket.io';
import type { Ack } from '../../shared/protocol/ack';
import type { FieldError } from '../../shared/validation/field-errors';
import { SESSION_ENDED_MESSAGE, SESSION_UNCHECKED_MESSAGE, type SessionCheck } from '../auth/session-revocation';
import type { AuthUser } from '../auth/user-store';

/** Carries out one event for the user as they are now; answers with data or field errors, never throws on bad input. */
export type EventHandler = (request: unknown, user: AuthUser) => Ack<unknown> | Promise<Ack<unknown>>;

export interface EventPipeline {
  /** Every event the socket takes, by name. */
  events: Readonly<Record<string, EventHandler>>;
  /**
   * Events that only steer a run this socket already holds (stop, pause, …) and read no team data.
   * When the database cannot answer their session check they go ahead as the user last verified
   * on this socket, so a run can always be stopped; an ended session still refuses them.
   */
  ownRunControls: ReadonlySet<string>;
  /** The socket's session and membership as they are now (session-revocation.ts). */
  check(): Promise<SessionCheck>;
  /** Hears every refusal, with the payload it answered (the run namespace mirrors them as run:error). */
  refused(request: unknown, errors: FieldError[]): void;
  /** The session ended: the refusal has been answered; end the socket. */
  revoked(): void;
  /** A handler threw (a bug or a database failure); the client has been answered. */
  failed(event: string, error: unknown): void;
  /** The database did not answer the session check; the event was refused, or went ahead as a control of the socket's own run. */
  unchecked(event: string, error: unknown): void;
}

/** The answer to a handler that threw: the details go to the log, not to the client. */
export const SERVER_ERROR: FieldError[] = [{ field: '', message: 'the request could not be carried out because of a server error; it has been logged' }];

/** The answer to an event this connection does not take, naming it and the ones it does. */
export function unknownEvent(event: string, known: readonly string[]): FieldError[] {
  return [{ field: 'event', message: `there is no event "${String(event).slice(0, 64)}" here; this connection takes ${known.join(', ')}` }];
}

/** The answer to an event sent with nothing but its acknowledgement. */
export function missingPayload(event: string): FieldError[] {
  return [{ field: '', message: `"${event}" needs a payload (an object); none was sent` }];
}

/** The acknowledgement of an event: socket.io passes it last, whatever came before (or nothing). */
export function splitAck(args: unknown[]): { request: unknown; reply: (response: Ack<unknown>) => void } {
  const last = args.at(-1);
  if (typeof last === 'function') return { request: args.length > 1 ? args[0] : undefined, reply: last as (response: Ack<unknown>) => void };
  return { request: args[0], reply: () => {} };
}

/**
 * Every event a socket sends is answered, in the order it arrived: an unknown event with a field
 * error naming it, a known one after its session check (started at once, so checks of a burst
 * overlap) and then its handler (run one at a time, so a pause sent before a scrub lands first).
 * A session found ended is answered and then revoked; a check the database could not answer
 * is answered as such (except for the controls of the socket's own run, which go ahead as the
 * user last verified), and nothing else on the socket (a live run) is touched.
 */
export function answerEvents(socket: Socket, pipeline: EventPipeline): void {
  const known = Object.keys(pipeline.events);
  // Unknown events reach no listener, so they are answered here (after the rate limit's middleware).
  socket.use((packet, next) => {
    const [event, ...args] = packet as [string, ...unknown[]];
    if (Object.hasOwn(pipeline.events, event)) return next();
    const { request, reply } = splitAck(args);
    const errors = unknownEvent(event, known);
    pipeline.refused(request, errors);
    reply({ status: 'error', errors });
  });

  let tail: Promise<void> = Promise.resolve();
  /** The user as the last successful check found them. */
  let verified: AuthUser | null = null;
  for (const [event, handle] of Object.entries(pipeline.events)) {
    socket.on(event, (...args: unknown[]) => {
      const { request, reply } = splitAck(args);
      const checked = pipeline.check();
      const answer = async (): Promise<void> => {
        const refuse = (errors: FieldError[]) => {
          pipeline.refused(request, errors);
          reply({ status: 'error', errors });
        };
        const session = await checked;
        if (session.status === 'revoked') {
          verified = null;
          refuse([{ field: '', message: SESSION_ENDED_MESSAGE }]);
          return pipeline.revoked();
        }
        let user: AuthUser;
        if (session.status === 'unavailable') {
          pipeline.unchecked(event, session.error);
          if (!verified || !pipeline.ownRunControls.has(event)) return refuse([{ field: '', message: SESSION_UNCHECKED_MESSAGE }]);
          user = verified;
        } else {
          user = verified = session.user;
        }
        // Every event here takes an object; without one the answer says so, not "value is required".
        if (request === undefined) return refuse(missingPayload(event));
        let response: Ack<unknown>;
        try {
          response = await handle(request, user);
        } catch (error) {
          pipeline.failed(event, error);
          return refuse(SERVER_ERROR);
        }
        if (response.status === 'error') return refuse(response.errors);
        reply(response);
      };
      // Each answer waits for the one before it; a failure of one never blocks the next.
      tail = tail.then(answer).catch((error: unknown) => pipeline.failed(event, error));
    });
  }
}
