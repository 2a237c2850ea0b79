import { describe, expect, it } from 'vitest';
import { DEFAULT_RESPONSE_DT, parseCliArguments } from './cli-arguments';

describe('parseCliArguments', () => {
  it('parses response with its defaults', () => {
    expect(parseCliArguments(['response', 'a.json'])).toEqual({ ok: true, value: { command: 'response', file: 'a.json', dt: DEFAULT_RESPONSE_DT, format: 'csv', method: 'closed-form' } });
  });

  it('parses --dt and --format in either order', () => {
    expect(parseCliArguments(['response', '--format', 'json', 'a.json', '--dt', '0.01'])).toMatchObject({ ok: true, value: { dt: 0.01, format: 'json' } });
    expect(parseCliArguments(['response', 'a.json', '--dt=2e-3'])).toMatchObject({ ok: true, value: { dt: 0.002 } });
  });

  it('parses check and help', () => {
    expect(parseCliArguments(['check', 'b.json'])).toEqual({ ok: true, value: { command: 'check', file: 'b.json', method: 'closed-form' } });
    expect(parseCliArguments(['--help'])).toEqual({ ok: true, value: { command: 'help' } });
  });

  it.each([
    [[], 'command', 'needed'],
    [['simulate', 'a.json'], 'command', 'unknown command'],
    [['response'], 'FILE', 'FILE'],
    [['response', 'a.json', '--dt', '0'], '--dt', 'positive'],
    [['response', 'a.json', '--dt', 'abc'], '--dt', 'positive'],
    [['response', 'a.json', '--dt=-1'], '--dt', 'positive'],
    [['response', 'a.json', '--dt', '-1'], '--dt', 'ambiguous'],
    [['response', 'a.json', '--format', 'xml'], '--format', 'csv or json'],
    [['response', 'a.json', '--colour'], '--colour', 'Unknown option'],
    [['check', 'a.json', '--dt', '0.1'], '--dt', 'belongs to "response"'],
    [['check', 'a.json', 'b.json'], '', 'unexpected argument'],
  ])('refuses %j naming %s', (argv, field, reason) => {
    const parsed = parseCliArguments(argv);
    expect(parsed.ok).toBe(false);
    if (parsed.ok) return;
    expect(parsed.errors[0]!.field).toBe(field);
    expect(parsed.errors[0]!.message).toContain(reason);
  });
});
