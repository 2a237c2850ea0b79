import { isRunActive, runStatusText, statusOfRunEnd } from './run-status';

describe('run status', () => {
  it('words every status for the status line', () => {
    expect(runStatusText({ kind: 'idle' })).toBe('idle');
    expect(runStatusText({ kind: 'running', time: 1.2345 })).toBe('running t = 1.23 s');
    expect(runStatusText({ kind: 'finished', time: 5 })).toBe('finished');
    expect(runStatusText({ kind: 'stopped', time: 0.4 })).toBe('stopped');
    expect(runStatusText({ kind: 'bound', message: 'angle left ±10 rad at t = 1.20 s', time: 1.2 })).toBe('stopped at bound: angle left ±10 rad at t = 1.20 s');
    expect(runStatusText({ kind: 'error', message: 'inertia must be positive' })).toBe('error: inertia must be positive');
  });

  it('maps each end reason to its status', () => {
    expect(statusOfRunEnd({ runId: 'r', reason: 'finished', message: '', simulatedTime: 5 })).toEqual({ kind: 'finished', time: 5 });
    expect(statusOfRunEnd({ runId: 'r', reason: 'stopped', message: '', simulatedTime: 1 })).toEqual({ kind: 'stopped', time: 1 });
    expect(statusOfRunEnd({ runId: 'r', reason: 'bound', message: 'speed bound', simulatedTime: 2 })).toEqual({ kind: 'bound', message: 'speed bound', time: 2 });
  });

  it('counts only starting and running as active', () => {
    expect(isRunActive({ kind: 'starting' })).toBe(true);
    expect(isRunActive({ kind: 'running', time: 0 })).toBe(true);
    expect(isRunActive({ kind: 'finished', time: 1 })).toBe(false);
    expect(isRunActive({ kind: 'error', message: 'x' })).toBe(false);
  });
});
