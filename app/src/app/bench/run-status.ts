import type { RunEnded } from '@kinetwin/shared/protocol/run-events';

/** Where the bench's run stands. Times are simulated seconds. */
export type RunStatus =
  | { kind: 'idle' }
  | { kind: 'starting' }
  | { kind: 'running'; time: number }
  | { kind: 'paused'; time: number }
  | { kind: 'finished'; time: number }
  | { kind: 'stopped'; time: number }
  | { kind: 'bound'; message: string; time: number }
  | { kind: 'error'; message: string };

/** The status after the server said the run ended. */
export function statusOfRunEnd(end: RunEnded): RunStatus {
  switch (end.reason) {
    case 'finished':
      return { kind: 'finished', time: end.simulatedTime };
    case 'stopped':
      return { kind: 'stopped', time: end.simulatedTime };
    case 'bound':
      return { kind: 'bound', message: end.message, time: end.simulatedTime };
  }
}

/** Whether a run is under way (or asked for, or paused), so Run waits and Stop acts. */
export function isRunActive(status: RunStatus): boolean {
  return status.kind === 'starting' || status.kind === 'running' || status.kind === 'paused';
}

/** Whether the server holds a run this bench can steer: pause, resume, speed, scrub and kick. */
export function isRunLive(status: RunStatus): boolean {
  return status.kind === 'running' || status.kind === 'paused';
}

/**
 * The status line under the bench's buttons.
 * @example runStatusText({ kind: 'running', time: 1.2345 }) // "running t = 1.23 s"
 * @example runStatusText({ kind: 'paused', time: 0.5 }) // "paused t = 0.50 s"
 */
export function runStatusText(status: RunStatus): string {
  switch (status.kind) {
    case 'idle':
      return 'idle';
    case 'starting':
      return 'starting';
    case 'running':
      return `running t = ${status.time.toFixed(2)} s`;
    case 'paused':
      return `paused t = ${status.time.toFixed(2)} s`;
    case 'finished':
      return 'finished';
    case 'stopped':
      return 'stopped';
    case 'bound':
      return `stopped at bound: ${status.message}`;
    case 'error':
      return `error: ${status.message}`;
  }
}
