import { DestroyRef, Injectable, inject } from '@angular/core';
import type { Ack } from '@kinetwin/shared/protocol/ack';
import type { RunControlState, RunEnded, RunFailed, RunFrame, RunKickRequest, RunKicked, RunSample, RunStartRequest, RunStarted } from '@kinetwin/shared/protocol/run-events';
import { BehaviorSubject, type Observable, Subject } from 'rxjs';
import { RUN_SOCKET_FACTORY } from './run-socket-factory';

/** What the page showing a run hears about it. Only events of the run this client started arrive. */
export type RunEvent =
  | { kind: 'frame'; frame: RunFrame }
  | { kind: 'end'; end: RunEnded }
  | { kind: 'failed'; failure: RunFailed };

/** State of the live link: socket.io reconnects by itself unless the server refused the handshake. */
export type RunLink = 'connecting' | 'connected' | 'reconnecting' | 'refused';

/** How long a start or stop request may wait for the server's answer, ms. */
export const RUN_ACK_TIMEOUT_MS = 10_000;
/**
 * Most events held while a start request awaits its ack. The server acks before it streams, so
 * only a reordering or a misbehaving server gets near this; past it the oldest are dropped.
 */
export const MAX_HELD_EVENTS = 2000;

export const LINK_LOST_MESSAGE = 'The live link to the server dropped, so the run stopped. Press Run to start again.';
export const NO_ANSWER_MESSAGE = `The server did not answer within ${RUN_ACK_TIMEOUT_MS / 1000} s. Check that it is running and press Run again.`;
export const SUPERSEDED_MESSAGE = 'A newer run request replaced this one.';
export const STOPPED_BEFORE_START_MESSAGE = 'Stopped before the server started the run.';
export const NOT_LIVE_MESSAGE = 'That run is no longer live: press Run to start a new one.';

/** An event of one run, tagged with that run's id for routing. */
interface RunScopedEvent {
  runId: string;
  event: RunEvent;
}

/** A start request waiting for its ack, with the events that arrived before the ack named its run. */
interface PendingStart {
  held: RunScopedEvent[];
  settle(ack: Ack<RunStarted>): void;
}

function errorAck<T>(message: string): Ack<T> {
  return { status: 'error', errors: [{ field: '', message }] };
}

/**
 * The live-run socket wrapped in RxJS. Provide it in the component that shows runs: the socket
 * opens with that component and closes (stopping its run) when the component is destroyed.
 */
@Injectable()
export class RunSocket {
  private readonly socket = inject(RUN_SOCKET_FACTORY)();

  private readonly events = new Subject<RunEvent>();
  readonly events$: Observable<RunEvent> = this.events.asObservable();
  private readonly link = new BehaviorSubject<RunLink>('connecting');
  readonly link$: Observable<RunLink> = this.link.asObservable();

  /** The run this client shows; frames of any other run (an old one still draining) are dropped. */
  private activeRunId: string | null = null;
  private pending: PendingStart | null = null;

  constructor() {
    this.socket.on('connect', () => this.link.next('connected'));
    this.socket.on('connect_error', (error) => {
      // An inactive socket after connect_error means the server refused the handshake (e.g. no
      // session): socket.io will not retry, so a waiting start must fail now rather than time out.
      if (this.socket.active) return;
      this.link.next('refused');
      this.failPending(`The server refused the live link: ${error.message}`);
    });
    this.socket.on('disconnect', () => {
      this.link.next(this.socket.active ? 'reconnecting' : 'refused');
      this.failPending(LINK_LOST_MESSAGE);
      if (this.activeRunId !== null) {
        const runId = this.activeRunId;
        this.activeRunId = null;
        this.events.next({ kind: 'failed', failure: { runId, errors: [{ field: '', message: LINK_LOST_MESSAGE }] } });
      }
    });
    this.socket.on('run:frame', (frame) => this.route({ runId: frame.runId, event: { kind: 'frame', frame } }));
    this.socket.on('run:end', (end) => this.route({ runId: end.runId, event: { kind: 'end', end } }));
    this.socket.on('run:error', (failure) => {
      if (failure.runId !== null) {
        this.route({ runId: failure.runId, event: { kind: 'failed', failure } });
      } else if (this.pending) {
        // A refused request without a run id answers the start in flight.
        this.settlePending({ status: 'error', errors: failure.errors });
      } else {
        this.events.next({ kind: 'failed', failure });
      }
    });

    inject(DestroyRef).onDestroy(() => {
      if (this.activeRunId !== null) this.socket.emit('run:stop', { runId: this.activeRunId }, () => undefined);
      this.pending?.settle(errorAck(SUPERSEDED_MESSAGE));
      this.pending = null;
      this.activeRunId = null;
      this.socket.disconnect();
      this.events.complete();
      this.link.complete();
    });
  }

  /**
   * Asks the server to start a run. A run this client was showing is stopped first, and its
   * remaining frames are dropped. Resolves with the server's ack, or an error ack when the
   * server does not answer within RUN_ACK_TIMEOUT_MS or the link drops meanwhile.
   */
  start(request: RunStartRequest): Promise<Ack<RunStarted>> {
    this.abandonActiveRun();
    this.settlePending(errorAck(SUPERSEDED_MESSAGE));

    return new Promise<Ack<RunStarted>>((resolve) => {
      let settled = false;
      const attempt: PendingStart = {
        held: [],
        settle: (ack) => {
          if (settled) return;
          settled = true;
          clearTimeout(timer);
          resolve(ack);
        },
      };
      const timer = setTimeout(() => this.settlePending(errorAck(NO_ANSWER_MESSAGE), attempt), RUN_ACK_TIMEOUT_MS);
      this.pending = attempt;

      this.socket.emit('run:start', request, (ack) => {
        if (this.pending !== attempt) {
          // Timed out, superseded or the link dropped: nobody shows this run, so do not let it run on.
          if (ack.status === 'ok') this.socket.emit('run:stop', { runId: ack.data.runId }, () => undefined);
          return;
        }
        this.pending = null;
        if (ack.status === 'ok') this.activeRunId = ack.data.runId;
        attempt.settle(ack);
        if (ack.status === 'ok') {
          for (const scoped of attempt.held) if (scoped.runId === ack.data.runId) this.deliver(scoped.event);
        }
      });
    });
  }

  /**
   * Asks the server to stop the run this client shows. Resolves with the server's ack, or null when
   * no run is going. A start still waiting for its ack is abandoned (its run is stopped on arrival).
   * The run's 'end' event (reason 'stopped') still arrives through events$.
   */
  stop(): Promise<Ack<{ runId: string }> | null> {
    this.settlePending(errorAck(STOPPED_BEFORE_START_MESSAGE));
    const runId = this.activeRunId;
    if (runId === null) return Promise.resolve(null);
    return new Promise((resolve) => {
      const timer = setTimeout(() => resolve(errorAck(NO_ANSWER_MESSAGE)), RUN_ACK_TIMEOUT_MS);
      this.socket.emit('run:stop', { runId }, (ack) => {
        clearTimeout(timer);
        resolve(ack);
      });
    });
  }

  /** Pauses the live run; resolves with where it stands (state 'paused' and the last time sent). */
  pause(runId: string): Promise<Ack<RunControlState>> {
    return this.control<RunControlState>(runId, (reply) => this.socket.emit('run:pause', { runId }, reply));
  }

  /** Resumes a paused run from the time it was paused at. */
  resume(runId: string): Promise<Ack<RunControlState>> {
    return this.control<RunControlState>(runId, (reply) => this.socket.emit('run:resume', { runId }, reply));
  }

  /** Changes the playback speed of the live run: × real time, or 0 for as fast as possible. */
  setSpeed(runId: string, speed: number): Promise<Ack<RunControlState>> {
    return this.control<RunControlState>(runId, (reply) => this.socket.emit('run:speed', { runId, speed }, reply));
  }

  /** Pauses the live run and resolves with its recorded sample nearest to `time` (s). */
  scrub(runId: string, time: number): Promise<Ack<RunSample>> {
    return this.control<RunSample>(runId, (reply) => this.socket.emit('run:scrub', { runId, time }, reply));
  }

  /** Appends a kick at the twin's current time; resolves with the forcing term the run took. */
  kick(runId: string, kick: RunKickRequest['kick']): Promise<Ack<RunKicked>> {
    return this.control<RunKicked>(runId, (reply) => this.socket.emit('run:kick', { runId, kick }, reply));
  }

  /**
   * Sends one control request of the run this client shows and resolves with the server's ack,
   * or an error ack when the run is not the live one here or the server does not answer in time.
   */
  private control<T>(runId: string, send: (reply: (ack: Ack<T>) => void) => void): Promise<Ack<T>> {
    // A run that ended (or was never ours) cannot be steered: say so without a round trip.
    if (runId !== this.activeRunId) return Promise.resolve(errorAck<T>(NOT_LIVE_MESSAGE));
    return new Promise((resolve) => {
      const timer = setTimeout(() => resolve(errorAck<T>(NO_ANSWER_MESSAGE)), RUN_ACK_TIMEOUT_MS);
      send((ack) => {
        clearTimeout(timer);
        resolve(ack);
      });
    });
  }

  private route(scoped: RunScopedEvent): void {
    if (scoped.runId === this.activeRunId) {
      this.deliver(scoped.event);
    } else if (this.pending) {
      if (this.pending.held.length >= MAX_HELD_EVENTS) this.pending.held.shift();
      this.pending.held.push(scoped);
    }
    // Anything else belongs to a run nobody here shows any more.
  }

  private deliver(event: RunEvent): void {
    // An end or a failure is the run's last word: later strays with its id are dropped.
    if (event.kind !== 'frame') this.activeRunId = null;
    this.events.next(event);
  }

  private abandonActiveRun(): void {
    if (this.activeRunId === null) return;
    this.socket.emit('run:stop', { runId: this.activeRunId }, () => undefined);
    this.activeRunId = null;
  }

  /** Settles the waiting start (only `attempt`, when given) and forgets it. */
  private settlePending(ack: Ack<RunStarted>, attempt: PendingStart | null = this.pending): void {
    if (!attempt || attempt !== this.pending) return;
    this.pending = null;
    attempt.settle(ack);
  }

  private failPending(message: string): void {
    this.settlePending(errorAck(message));
  }
}
