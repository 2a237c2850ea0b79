import { randomUUID } from 'node:crypto';
import type { Namespace, Socket } from 'socket.io';
import type { z } from 'zod';
import type { Ack } from '../../shared/protocol/ack';
import { runKickSchema, runScrubSchema, runSpeedSchema, runStartSchema, runStopSchema } from '../../shared/protocol/run-requests';
import type { ClientToServerEvents, InterServerEvents, RunClientEvent, ServerToClientEvents, SocketData } from '../../shared/protocol/run-events';
import type { Scenario } from '../../shared/scenario/scenario-schema';
import { twinScenarioErrors } from '../../shared/twin/twin-scenario-errors';
import { parseWith, type FieldError } from '../../shared/validation/field-errors';
import { ACTION_WORDS, roleMay, type Action } from '../auth/permissions';
import {
  checkSocketSession,
  handshakeSession,
  SESSION_CHECK_TIMEOUT_MS,
  SESSION_ENDED_MESSAGE,
  sessionRoom,
  userRoom,
  type SocketRevoker,
  type SocketSessionRef,
} from '../auth/session-revocation';
import type { AuthUser } from '../auth/user-store';
import type { Database } from '../db/database';
import type { Logger } from '../logging/logger';
import { archivedRefusal } from '../scenarios/scenario-access';
import { loadScenario, storedDocument } from '../scenarios/scenario-store';
import { limitRunEvents } from './event-rate-limit';
import { startLiveRun, type LiveRun } from './live-run';
import { answerEvents, type EventHandler } from './run-event-pipeline';

export type RunNamespace = Namespace<ClientToServerEvents, ServerToClientEvents, InterServerEvents, SocketData>;
type RunSocket = Socket<ClientToServerEvents, ServerToClientEvents, InterServerEvents, SocketData>;

/**
 * The action of the role table (permissions.ts) a run needs: a stored scenario is read from the
 * team's library, an inline one is the bench's own draft. Controlling a run needs what starting it did.
 */
export const RUN_ACCESS = { stored: 'scenario.read', inline: 'bench.check' } as const satisfies Record<string, Action>;

/**
 * How often sockets with a live run are checked again without any event from them, ms: a run
 * streaming to a session that ended where no hook could tell this node stops within this time.
 */
export const SESSION_RECHECK_MS = 5000;

/** The events that steer the socket's own run and read no team data (see EventPipeline.ownRunControls). */
const OWN_RUN_CONTROLS: ReadonlySet<RunClientEvent> = new Set(['run:stop', 'run:pause', 'run:resume', 'run:speed', 'run:scrub', 'run:kick']);

export interface RunHandlerDeps {
  db: Database;
  logger: Logger;
  maxLiveRuns: number;
  /** ms; see SESSION_CHECK_TIMEOUT_MS. */
  sessionCheckTimeoutMs?: number;
  /** ms; see SESSION_RECHECK_MS. */
  sessionRecheckMs?: number;
}

export interface RunHandlers extends SocketRevoker {
  liveRuns(): number;
}

/** One connection: who it was opened for and the run it holds. */
interface Connection {
  socket: RunSocket;
  ref: SocketSessionRef;
  current: { run: LiveRun; access: Action } | null;
}

/**
 * Live runs over socket.io: one run per connection at a time (a new start replaces the old run),
 * every payload validated, every event answered (unknown ones too) with data or field errors and
 * never thrown, at most MAX_RUN_EVENTS_PER_SECOND events a second taken from one connection, and
 * every event checked against the session and the membership as they are now. Sockets join a
 * room per user and per session, so revoking either ends them (`endSockets`).
 */
export function registerRunHandlers(nsp: RunNamespace, deps: RunHandlerDeps): RunHandlers {
  const { db, logger } = deps;
  const checkTimeout = deps.sessionCheckTimeoutMs ?? SESSION_CHECK_TIMEOUT_MS;
  const connections = new Map<string, Connection>();
  let live = 0;

  nsp.use((socket, next) => {
    const ref = handshakeSession(socket.request);
    if (!ref) return next(new Error('Sign in first: live runs need a signed-in session.'));
    socket.data.userId = ref.userId;
    socket.data.sessionId = ref.sessionId;
    socket.data.generation = ref.generation;
    next();
  });

  const endSocket = (socket: RunSocket, message: string) => {
    socket.emit('run:error', { runId: null, errors: [{ field: '', message }] });
    socket.disconnect(true);
  };

  nsp.on('connection', (socket: RunSocket) => {
    const ref: SocketSessionRef = { userId: socket.data.userId, sessionId: socket.data.sessionId, generation: socket.data.generation };
    const connection: Connection = { socket, ref, current: null };
    connections.set(socket.id, connection);
    void socket.join([userRoom(ref.userId), sessionRoom(ref.sessionId)]);

    limitRunEvents(socket, (errors) => socket.emit('run:error', { runId: connection.current?.run.runId ?? null, errors }));
    const events: Record<RunClientEvent, EventHandler> = {
      'run:start': (request, user) => startRun(connection, request, user),
      'run:stop': control(connection, runStopSchema, (run) => {
        run.stop();
        return { ok: true, value: { runId: run.runId } };
      }),
      'run:pause': control(connection, runStopSchema, (run) => ({ ok: true, value: run.pause() })),
      'run:resume': control(connection, runStopSchema, (run) => ({ ok: true, value: run.resume() })),
      'run:speed': control(connection, runSpeedSchema, (run, r) => ({ ok: true, value: run.setSpeed(r.speed) })),
      'run:scrub': control(connection, runScrubSchema, (run, r) => run.scrub(r.time)),
      'run:kick': control(connection, runKickSchema, (run, r) => {
        const term = run.kick(r.kick);
        if (!term.ok) return { ok: false, errors: term.errors.map((e) => ({ field: e.field ? `kick.${e.field}` : 'kick', message: e.message })) };
        return { ok: true, value: { runId: run.runId, term: term.value } };
      }),
    };
    answerEvents(socket, {
      events,
      ownRunControls: OWN_RUN_CONTROLS,
      check: () => checkSocketSession(db, ref, checkTimeout),
      refused: (request, errors) => socket.emit('run:error', { runId: runIdOf(request), errors }),
      revoked: () => socket.disconnect(true),
      failed: (event, err) => logger.error({ err, event, userId: ref.userId }, 'run event failed'),
      unchecked: (event, err) => logger.warn({ err, event, userId: ref.userId }, 'run event: the session could not be checked (only controls of the socket’s own run go ahead)'),
    });

    socket.on('disconnect', () => {
      connection.current?.run.stop();
      connections.delete(socket.id);
    });
  });

  async function startRun(connection: Connection, request: unknown, user: AuthUser): Promise<Ack<unknown>> {
    const parsed = parseWith(runStartSchema, request);
    if (!parsed.ok) return { status: 'error', errors: parsed.errors };
    const stored = parsed.value.scenarioId !== undefined;
    const access = stored ? RUN_ACCESS.stored : RUN_ACCESS.inline;
    if (!roleMay(user.role, access)) return { status: 'error', errors: roleRefusal(user, access) };
    let scenario: Scenario;
    if (parsed.value.scenarioId !== undefined) {
      const id = parsed.value.scenarioId;
      const row = await loadScenario(db, user.teamId, id);
      if (!row) return { status: 'error', errors: [{ field: 'scenarioId', message: `there is no scenario ${id} in your team's library` }] };
      if (row.archivedAt !== null) return { status: 'error', errors: [{ field: 'scenarioId', message: archivedRefusal('run').message }] };
      scenario = storedDocument(row.document, `scenario ${id}`);
    } else {
      scenario = parsed.value.scenario!;
    }
    // Rules of the twin alone (e.g. an encoder needs a sampled controller), named by field.
    const twinErrors = twinScenarioErrors(scenario);
    if (twinErrors.length > 0) {
      const prefix = stored ? '' : 'scenario.';
      return { status: 'error', errors: twinErrors.map((e) => ({ field: `${prefix}${e.field}`, message: e.message })) };
    }
    connection.current?.run.stop();
    if (live >= deps.maxLiveRuns) {
      return { status: 'error', errors: [{ field: '', message: `the server is running ${deps.maxLiveRuns} live runs already; try again shortly` }] };
    }
    const runId = randomUUID();
    const { socket } = connection;
    live++;
    const run = startLiveRun(runId, scenario, { speed: parsed.value.speed, dt: parsed.value.dt }, {
      frame: (frame) => socket.emit('run:frame', frame),
      end: (end) => {
        live--;
        if (connection.current?.run.runId === runId) connection.current = null;
        socket.emit('run:end', end);
      },
    });
    connection.current = { run, access };
    return { status: 'ok', data: { runId, scenarioName: scenario.name, horizon: scenario.horizon, dt: parsed.value.dt } };
  }

  /** A control event: parsed, aimed at this connection's run, allowed for the role as it is now. */
  function control<S extends z.ZodType<{ runId: string }>, T>(connection: Connection, schema: S, act: (run: LiveRun, request: z.output<S>) => { ok: true; value: T } | { ok: false; errors: FieldError[] }): EventHandler {
    return (request, user) => {
      const parsed = parseWith(schema, request);
      if (!parsed.ok) return { status: 'error', errors: parsed.errors };
      const current = connection.current;
      if (!current || current.run.runId !== parsed.value.runId) return { status: 'error', errors: [{ field: 'runId', message: 'no live run with this id on this connection' }] };
      if (!roleMay(user.role, current.access)) return { status: 'error', errors: roleRefusal(user, current.access) };
      const done = act(current.run, parsed.value);
      return done.ok ? { status: 'ok', data: done.value } : { status: 'error', errors: done.errors };
    };
  }

  // A run streams without events from its client, so its session is looked at again now and then.
  let sweeping = false;
  const sweep = setInterval(() => {
    if (sweeping) return;
    const streaming = [...connections.values()].filter((c) => c.current !== null);
    if (streaming.length === 0) return;
    sweeping = true;
    void Promise.all(
      streaming.map(async ({ socket, ref }) => {
        const session = await checkSocketSession(db, ref, checkTimeout);
        // A database that does not answer leaves the run going: only a session seen ended stops it.
        if (session.status === 'revoked') endSocket(socket, SESSION_ENDED_MESSAGE);
      }),
    ).finally(() => {
      sweeping = false;
    });
  }, deps.sessionRecheckMs ?? SESSION_RECHECK_MS);
  sweep.unref();

  return {
    liveRuns: () => live,
    endSockets: (room, message) => {
      // Through the adapter, so with a cluster adapter the sockets of every node go.
      nsp.to(room).emit('run:error', { runId: null, errors: [{ field: '', message }] });
      nsp.in(room).disconnectSockets(true);
    },
  };
}

function roleRefusal(user: AuthUser, action: Action): FieldError[] {
  return [{ field: '', message: `your role (${user.role}) may not ${ACTION_WORDS[action]}` }];
}

/** The run an answered payload named, for the run:error that mirrors the answer. */
function runIdOf(request: unknown): string | null {
  const runId = typeof request === 'object' && request !== null ? (request as { runId?: unknown }).runId : undefined;
  return typeof runId === 'string' && runId.length > 0 && runId.length <= 64 ? runId : null;
}
