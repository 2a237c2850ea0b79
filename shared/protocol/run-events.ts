import type { FieldError } from '../validation/field-errors';
import type { AckCallback } from './ack';
import type { InputTerm } from '../scenario/scenario-schema';
import type { RunKickRequest, RunScrubRequest, RunSpeedRequest, RunStartRequest, RunStopRequest } from './run-requests';

export type { RunKickRequest, RunScrubRequest, RunSpeedRequest, RunStartRequest, RunStopRequest };

/** socket.io namespace for live runs. */
export const RUN_NAMESPACE = '/runs';

/** Playback speeds a live run accepts, × real time; 0 means as fast as the server can. */
export const MIN_RUN_SPEED = 0.1;
export const MAX_RUN_SPEED = 10;
/** Output spacing of a live run's samples, s: fine enough to draw, coarse enough to stream. */
export const DEFAULT_RUN_DT = 0.002;

export interface RunStarted {
  runId: string;
  scenarioName: string;
  horizon: number;
  dt: number;
}

/** A batch of twin samples; arrays are parallel and in time order. */
export interface RunFrame {
  runId: string;
  /** Simulated time, s. */
  t: number[];
  /** Joint angle, rad. */
  angle: number[];
  /** Joint velocity, rad/s. */
  velocity: number[];
  /** Torque the controller asks for at the joint (N × motor torque), N·m. */
  controllerTorque: number[];
  /** Drive torque that reached the joint after the torque limit and dead band, N·m. */
  appliedTorque: number[];
  /** 1 where the drive request exceeds the torque limit, else 0. */
  saturating: number[];
  /** 1 where static friction holds the joint, else 0. */
  sticking: number[];
}

/** One recorded sample of a run, as a scrub returns it. */
export interface RunSample {
  t: number;
  angle: number;
  velocity: number;
  controllerTorque: number;
  appliedTorque: number;
  saturating: boolean;
  sticking: boolean;
}

/** Where a live run stands after a pause, resume or speed change. */
export interface RunControlState {
  runId: string;
  state: 'running' | 'paused';
  /** × real time; 0 = as fast as possible. */
  speed: number;
  /** Last simulated time sent to the client, s. */
  simulatedTime: number;
}

/** The forcing term a kick appended to the run (its delay is when it acts), for the closed form. */
export interface RunKicked {
  runId: string;
  term: InputTerm;
}

/** Most recorded samples a live run keeps for scrubbing; older ones are dropped first. */
export const MAX_SCRUB_HISTORY = 250_000;

/**
 * Events one connection may send per second (starts, controls, scrubs and kicks together); the
 * rest are refused with an error until the second is over. Dragging the scrub slider sends a few
 * dozen a second at most.
 */
export const MAX_RUN_EVENTS_PER_SECOND = 60;

export type RunEndReason = 'finished' | 'stopped' | 'bound';

export interface RunEnded {
  runId: string;
  reason: RunEndReason;
  /** What happened, in words an engineer can act on (e.g. which bound was hit and when). */
  message: string;
  /** Last simulated time reached, s. */
  simulatedTime: number;
}

export interface RunFailed {
  runId: string | null;
  errors: FieldError[];
}

export interface ServerToClientEvents {
  'run:frame': (frame: RunFrame) => void;
  'run:end': (end: RunEnded) => void;
  'run:error': (failure: RunFailed) => void;
}

export interface ClientToServerEvents {
  'run:start': (request: RunStartRequest, ack: AckCallback<RunStarted>) => void;
  'run:stop': (request: RunStopRequest, ack: AckCallback<{ runId: string }>) => void;
  'run:pause': (request: RunStopRequest, ack: AckCallback<RunControlState>) => void;
  'run:resume': (request: RunStopRequest, ack: AckCallback<RunControlState>) => void;
  'run:speed': (request: RunSpeedRequest, ack: AckCallback<RunControlState>) => void;
  /** Pauses the run and answers with the recorded sample nearest to the time asked for. */
  'run:scrub': (request: RunScrubRequest, ack: AckCallback<RunSample>) => void;
  /** Appends a forcing term at the twin's current time (a kick). */
  'run:kick': (request: RunKickRequest, ack: AckCallback<RunKicked>) => void;
}

/** Every event a client may send on the run namespace; anything else is answered with an error. */
export const RUN_CLIENT_EVENTS = ['run:start', 'run:stop', 'run:pause', 'run:resume', 'run:speed', 'run:scrub', 'run:kick'] as const satisfies readonly (keyof ClientToServerEvents)[];
export type RunClientEvent = (typeof RUN_CLIENT_EVENTS)[number];

export type InterServerEvents = Record<string, never>;

/** What the server keeps on each socket from its handshake, to check the session again per event. */
export interface SocketData {
  userId: number;
  /** The cookie session the socket was opened under (express-session's id). */
  sessionId: string;
  /** The user's session generation at the handshake; sign-out everywhere raises it. */
  generation: number;
}
