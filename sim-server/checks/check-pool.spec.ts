import { describe, expect, it } from 'vitest';
import { workerExecArgv } from './check-pool';

describe('workerExecArgv', () => {
  it('keeps the server\'s own --import tsx as it is', () => {
    expect(workerExecArgv(['--import', 'tsx'])).toEqual(['--import', 'tsx']);
    expect(workerExecArgv(['--import=tsx', '--enable-source-maps'])).toEqual(['--import=tsx', '--enable-source-maps']);
  });

  it('adds tsx for a process that loads TypeScript another way, keeping its flags', () => {
    expect(workerExecArgv([])).toEqual(['--import', 'tsx']);
    expect(workerExecArgv(['--conditions', 'node'])).toEqual(['--conditions', 'node', '--import', 'tsx']);
    // "tsx" as another flag's value is not the loader.
    expect(workerExecArgv(['--conditions', 'tsx'])).toEqual(['--conditions', 'tsx', '--import', 'tsx']);
  });
});
