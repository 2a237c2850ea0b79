import { randomUUID } from 'node:crypto';
import type { Namespace, Socket } from 'socket.io';
import type { Ack } from '../../shared/protocol/ack';
import { runStartSchema, runStopSchema } from '../../shared/protocol/run-requests';
import {
  type ClientToServerEvents,
  type InterServerEvents,
  type RunStarted,
  type ServerToClientEvents,
  type SocketData,
} from '../../shared/protocol/run-events';
import type { Scenario } from '../../shared/scenario/scenario-schema';
import { parseWith, type FieldError } from '../../shared/validation/field-errors';
import type { AuthUser } from '../auth/user-store';
import type { Database } from '../db/database';
import type { Logger } from '../logging/logger';
import { findTeamScenario } from '../scenarios/scenario-store';
import { startLiveRun, type LiveRun } from './live-run';

export type RunNamespace = Namespace<ClientToServerEvents, ServerToClientEvents, InterServerEvents, SocketData>;
type RunSocket = Socket<ClientToServerEvents, ServerToClientEvents, InterServerEvents, SocketData>;

export interface RunHandlerDeps {
  db: Database;
  logger: Logger;
  maxLiveRuns: number;
}

/**
 * Live runs over socket.io: one run per connection at a time (a new start replaces the old run),
 * every payload validated, every failure answered with field errors and never thrown.
 */
export function registerRunHandlers(nsp: RunNamespace, { db, logger, maxLiveRuns }: RunHandlerDeps): { liveRuns(): number } {
  let live = 0;

  nsp.use((socket, next) => {
    const user = (socket.request as { user?: AuthUser }).user;
    if (!user) return next(new Error('Sign in first: live runs need a signed-in session.'));
    socket.data.userId = user.id;
    next();
  });

  nsp.on('connection', (socket: RunSocket) => {
    const user = (socket.request as { user?: AuthUser }).user!;
    let current: LiveRun | null = null;

    const refuse = <T>(ack: unknown, runId: string | null, errors: FieldError[]) => {
      socket.emit('run:error', { runId, errors });
      replyTo<T>(ack)({ status: 'error', errors });
    };

    socket.on('run:start', async (request, ack) => {
      try {
        const parsed = parseWith(runStartSchema, request);
        if (!parsed.ok) return refuse(ack, null, parsed.errors);
        let scenario: Scenario;
        if (parsed.value.scenarioId !== undefined) {
          const detail = await findTeamScenario(db, user.teamId, parsed.value.scenarioId);
          if (!detail) return refuse(ack, null, [{ field: 'scenarioId', message: `there is no scenario ${parsed.value.scenarioId} in your team's library` }]);
          scenario = detail.scenario;
        } else {
          scenario = parsed.value.scenario!;
        }
        current?.stop();
        if (live >= maxLiveRuns) {
          return refuse(ack, null, [{ field: '', message: `the server is running ${maxLiveRuns} live runs already; try again shortly` }]);
        }
        const runId = randomUUID();
        live++;
        const run = startLiveRun(runId, scenario, { speed: parsed.value.speed, dt: parsed.value.dt }, {
          frame: (frame) => socket.emit('run:frame', frame),
          end: (end) => {
            live--;
            if (current?.runId === runId) current = null;
            socket.emit('run:end', end);
          },
        });
        current = run;
        replyTo<RunStarted>(ack)({ status: 'ok', data: { runId, scenarioName: scenario.name, horizon: scenario.horizon, dt: parsed.value.dt } });
      } catch (err) {
        logger.error({ err, userId: user.id }, 'run:start failed');
        refuse(ack, null, [{ field: '', message: 'the run could not be started because of a server error; it has been logged' }]);
      }
    });

    socket.on('run:stop', (request, ack) => {
      const parsed = parseWith(runStopSchema, request);
      if (!parsed.ok) return refuse(ack, null, parsed.errors);
      if (!current || current.runId !== parsed.value.runId) {
        return refuse(ack, parsed.value.runId, [{ field: 'runId', message: 'no live run with this id on this connection' }]);
      }
      current.stop();
      replyTo<{ runId: string }>(ack)({ status: 'ok', data: { runId: parsed.value.runId } });
    });

    socket.on('disconnect', () => current?.stop());
  });

  return { liveRuns: () => live };
}

/** A client may omit the acknowledgement or send something else in its place. */
function replyTo<T>(ack: unknown): (response: Ack<T>) => void {
  return typeof ack === 'function' ? (ack as (response: Ack<T>) => void) : () => {};
}
