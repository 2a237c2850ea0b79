import type { FieldError } from '../validation/field-errors';
import type { AckCallback } from './ack';
import type { RunStartRequest, RunStopRequest } from './run-requests';

export type { RunStartRequest, RunStopRequest };

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
}

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
}

export type InterServerEvents = Record<string, never>;

export interface SocketData {
  userId: number;
}
