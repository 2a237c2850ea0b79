import { RateLimiterMemory, RateLimiterRes } from 'rate-limiter-flexible';
import type { Socket } from 'socket.io';
import { MAX_RUN_EVENTS_PER_SECOND } from '../../shared/protocol/run-events';
import type { FieldError } from '../../shared/validation/field-errors';

/** What a refused event is answered with, naming the limit. */
export function tooManyEvents(perSecond: number, msBeforeNext: number): FieldError[] {
  return [
    {
      field: '',
      message: `too many events on this connection: at most ${perSecond} a second; this one was dropped, try again in ${Math.max(1, Math.ceil(msBeforeNext))} ms`,
    },
  ];
}

/**
 * Caps the events one connection may send, so a client flooding the socket costs the server a
 * counter per event and no work; other connections are unaffected. A refused event is answered
 * through its acknowledgement when it has one, and `onFlood` hears of the first refusal of each
 * second (to tell the client once, not once per dropped event).
 * @example limitRunEvents(socket, (errors) => socket.emit('run:error', { runId: null, errors }))
 */
export function limitRunEvents(
  socket: Socket,
  onFlood: (errors: FieldError[]) => void,
  perSecond = MAX_RUN_EVENTS_PER_SECOND,
): void {
  // One limiter per connection: its only key is the connection, and it goes with the socket.
  const limiter = new RateLimiterMemory({ points: perSecond, duration: 1 });
  socket.use((packet, next) => {
    limiter.consume(socket.id).then(
      () => next(),
      (rejection: unknown) => {
        if (!(rejection instanceof RateLimiterRes)) return next(rejection instanceof Error ? rejection : new Error(String(rejection)));
        const errors = tooManyEvents(perSecond, rejection.msBeforeNext);
        const ack = packet[packet.length - 1];
        if (typeof ack === 'function') (ack as (reply: unknown) => void)({ status: 'error', errors });
        if (rejection.consumedPoints === perSecond + 1) onFlood(errors);
      },
    );
  });
}
