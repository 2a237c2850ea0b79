import { randomUUID } from 'node:crypto';
import type { Namespace, Socket } from 'socket.io';
import type { Ack } from '../../shared/protocol/ack';
import { runKickSchema, runScrubSchema, runSpeedSchema, runStartSchema, runStopSchema } from '../../shared/protocol/run-requests';
import {
  type ClientToServerEvents,
  type InterServerEvents,
  type RunControlState,
  type RunKicked,
  type RunSample,
  type RunStarted,
  type ServerToClientEvents,
  type SocketData,
} from '../../shared/protocol/run-events';
import type { Scenario } from '../../shared/scenario/scenario-schema';
import { twinScenarioErrors } from '../../shared/twin/twin-scenario-errors';
import { parseWith, type FieldError } from '../../shared/validation/field-errors';
import type { AuthUser } from '../auth/user-store';
import type { Database } from '../db/database';
import type { Logger } from '../logging/logger';
import { findTeamScenario } from '../scenarios/scenario-store';
import { limitRunEvents } from './event-rate-limit';
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
 * every payload validated, every failure answered with field errors and never thrown, and at most
 * MAX_RUN_EVENTS_PER_SECOND events a second taken from one connection.
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
    limitRunEvents(socket, (errors) => socket.emit('run:error', { runId: current?.runId ?? null, errors }));

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
        // Rules of the twin alone (e.g. an encoder needs a sampled controller), named by field.
        const twinErrors = twinScenarioErrors(scenario);
        if (twinErrors.length > 0) {
          const prefix = parsed.value.scenarioId !== undefined ? '' : 'scenario.';
          return refuse(ack, null, twinErrors.map((e) => ({ field: `${prefix}${e.field}`, message: e.message })));
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

    /** The live run a control event names, or field errors saying why there is none. */
    const runNamed = (runId: string): LiveRun | null => (current && current.runId === runId ? current : null);
    const noSuchRun = [{ field: 'runId', message: 'no live run with this id on this connection' }];

    socket.on('run:stop', (request, ack) => {
      const parsed = parseWith(runStopSchema, request);
      if (!parsed.ok) return refuse(ack, null, parsed.errors);
      const run = runNamed(parsed.value.runId);
      if (!run) return refuse(ack, parsed.value.runId, noSuchRun);
      run.stop();
      replyTo<{ runId: string }>(ack)({ status: 'ok', data: { runId: parsed.value.runId } });
    });

    socket.on('run:pause', (request, ack) => {
      const parsed = parseWith(runStopSchema, request);
      if (!parsed.ok) return refuse(ack, null, parsed.errors);
      const run = runNamed(parsed.value.runId);
      if (!run) return refuse(ack, parsed.value.runId, noSuchRun);
      replyTo<RunControlState>(ack)({ status: 'ok', data: run.pause() });
    });

    socket.on('run:resume', (request, ack) => {
      const parsed = parseWith(runStopSchema, request);
      if (!parsed.ok) return refuse(ack, null, parsed.errors);
      const run = runNamed(parsed.value.runId);
      if (!run) return refuse(ack, parsed.value.runId, noSuchRun);
      replyTo<RunControlState>(ack)({ status: 'ok', data: run.resume() });
    });

    socket.on('run:speed', (request, ack) => {
      const parsed = parseWith(runSpeedSchema, request);
      if (!parsed.ok) return refuse(ack, null, parsed.errors);
      const run = runNamed(parsed.value.runId);
      if (!run) return refuse(ack, parsed.value.runId, noSuchRun);
      replyTo<RunControlState>(ack)({ status: 'ok', data: run.setSpeed(parsed.value.speed) });
    });

    socket.on('run:scrub', (request, ack) => {
      const parsed = parseWith(runScrubSchema, request);
      if (!parsed.ok) return refuse(ack, null, parsed.errors);
      const run = runNamed(parsed.value.runId);
      if (!run) return refuse(ack, parsed.value.runId, noSuchRun);
      const sample = run.scrub(parsed.value.time);
      if (!sample.ok) return refuse(ack, parsed.value.runId, sample.errors);
      replyTo<RunSample>(ack)({ status: 'ok', data: sample.value });
    });

    socket.on('run:kick', (request, ack) => {
      const parsed = parseWith(runKickSchema, request);
      if (!parsed.ok) return refuse(ack, null, parsed.errors);
      const run = runNamed(parsed.value.runId);
      if (!run) return refuse(ack, parsed.value.runId, noSuchRun);
      const term = run.kick(parsed.value.kick);
      if (!term.ok) return refuse(ack, parsed.value.runId, term.errors.map((e) => ({ field: e.field ? `kick.${e.field}` : 'kick', message: e.message })));
      replyTo<RunKicked>(ack)({ status: 'ok', data: { runId: parsed.value.runId, term: term.value } });
    });

    socket.on('disconnect', () => current?.stop());
  });

  return { liveRuns: () => live };
}

/** A client may omit the acknowledgement or send something else in its place. */
function replyTo<T>(ack: unknown): (response: Ack<T>) => void {
  return typeof ack === 'function' ? (ack as (response: Ack<T>) => void) : () => {};
}
