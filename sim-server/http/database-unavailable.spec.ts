import { describe, expect, it } from 'vitest';
import { databaseUnavailableError, isDatabaseUnavailable } from './database-unavailable';

const withCode = (message: string, code: string) => Object.assign(new Error(message), { code });

describe('isDatabaseUnavailable', () => {
  it.each([
    ['a refused connection', withCode('connect ECONNREFUSED 127.0.0.1:5432', 'ECONNREFUSED')],
    ['an admin shutdown (57P01)', withCode('terminating connection due to administrator command', '57P01')],
    ['a crash shutdown (57P02)', withCode('terminating connection because of crash of another server process', '57P02')],
    ['a database starting up (57P03)', withCode('the database system is starting up', '57P03')],
    ['a connection exception (class 08)', withCode('connection failure', '08006')],
    ['too many connections (53300)', withCode('sorry, too many clients already', '53300')],
    ["pg-pool's connect time-out", new Error('timeout exceeded when trying to connect')],
    ['a lost connection', new Error('Connection terminated unexpectedly')],
    ["node-postgres' read time-out", new Error('Query read timeout')],
    ['a refusal wrapped by Drizzle', new Error('Failed query: select 1', { cause: withCode('connect ECONNREFUSED', 'ECONNREFUSED') })],
    ['every address of a host name refused', new AggregateError([withCode('connect ECONNREFUSED ::1:5432', 'ECONNREFUSED')], '')],
  ])('is true for %s', (_name, err) => {
    expect(isDatabaseUnavailable(err)).toBe(true);
    expect(databaseUnavailableError(err)).toMatchObject({ status: 503, code: 'database_unavailable' });
  });

  it.each([
    ['a unique violation (23505)', withCode('duplicate key value violates unique constraint', '23505')],
    ['a syntax error (42601)', withCode('syntax error at or near "selec"', '42601')],
    ['a plain error', new Error('something else')],
    ['a thrown string', 'ECONNREFUSED'],
    ['nothing', undefined],
  ])('is false for %s', (_name, err) => {
    expect(isDatabaseUnavailable(err)).toBe(false);
    expect(databaseUnavailableError(err)).toBeNull();
  });
});
