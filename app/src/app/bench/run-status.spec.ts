import { isRunActive, isRunLive, runStatusText, statusOfRunEnd } from './run-status';

describe('run status', () => {
  it('words every status for the status line', () => {
    expect(runStatusText({ kind: 'idle' })).toBe('idle');
    expect(runStatusText({ kind: 'running', time: 1.2345 })).toBe('running t = 1.23 s');
    expect(runStatusText({ kind: 'paused', time: 0.5049 })).toBe('paused t = 0.50 s');
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

  it('counts starting, running and paused as active, and only running and paused as live', () => {
    expect(isRunActive({ kind: 'starting' })).toBe(true);
    expect(isRunActive({ kind: 'running', time: 0 })).toBe(true);
    expect(isRunActive({ kind: 'paused', time: 0.3 })).toBe(true);
    expect(isRunLive({ kind: 'starting' })).toBe(false);
    expect(isRunLive({ kind: 'running', time: 0 })).toBe(true);
    expect(isRunLive({ kind: 'paused', time: 0.3 })).toBe(true);
    expect(isRunLive({ kind: 'finished', time: 1 })).toBe(false);
    expect(isRunActive({ kind: 'finished', time: 1 })).toBe(false);
    expect(isRunActive({ kind: 'error', message: 'x' })).toBe(false);
  });
});
