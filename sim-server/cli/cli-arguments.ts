import { parseArgs } from 'node:util';
import { type FieldError, type Parsed } from '../../shared/validation/field-errors';

/** Output spacing of `kinetwin response` when --dt is not given, s. */
export const DEFAULT_RESPONSE_DT = 0.001;
export const RESPONSE_FORMATS = ['csv', 'json'] as const;
export type ResponseFormat = (typeof RESPONSE_FORMATS)[number];
/** Where the numbers come from: the closed form, the simulated twin, or both side by side. */
export const RESPONSE_METHODS = ['closed-form', 'sim', 'both'] as const;
export type ResponseMethod = (typeof RESPONSE_METHODS)[number];

export type CliCommand =
  | { command: 'response'; file: string; dt: number; format: ResponseFormat; method: ResponseMethod }
  | { command: 'check'; file: string; method: ResponseMethod }
  | { command: 'help' };

export const USAGE = `usage:
  kinetwin response FILE [--dt 0.001] [--format csv|json] [--method closed-form|sim|both]
      angle and velocity of a scenario on 0, dt, …, horizon: from the closed form (default),
      the simulated twin, or both with the residual twin − closed form
  kinetwin check FILE
      poles, theorem verdicts, step metrics, superposition and shift checks and the linear range
      as JSON; exit 1 when the scenario's limits are not met
exit codes: 0 ok, 1 limits not met (check), 2 invalid input, 3 the twin stopped at a bound (rows up to there printed)`;

/**
 * Parses the kinetwin command line (arguments after the script name). Errors name the argument.
 * @example parseCliArguments(['response', 'joint.json', '--dt', '0.01']) // { ok: true, value: { command: 'response', dt: 0.01, … } }
 */
export function parseCliArguments(argv: readonly string[]): Parsed<CliCommand> {
  let parsed: ReturnType<typeof parseArgs>;
  try {
    parsed = parseArgs({
      args: [...argv],
      allowPositionals: true,
      strict: true,
      options: {
        dt: { type: 'string' },
        format: { type: 'string' },
        method: { type: 'string' },
        help: { type: 'boolean', short: 'h' },
      },
    });
  } catch (err) {
    const message = (err as Error).message.split('\n')[0]!;
    const option = /'(--?[\w-]+)/.exec(message)?.[1] ?? '';
    return fail(option, message);
  }
  const { values, positionals } = parsed;
  if (values['help'] || positionals[0] === 'help') return { ok: true, value: { command: 'help' } };
  if (positionals.length === 0) return fail('command', 'a command is needed: "response" or "check"');
  const [command, file, ...extra] = positionals;
  if (command !== 'response' && command !== 'check') return fail('command', `unknown command "${command}": use "response" or "check"`);
  if (file === undefined) return fail('FILE', `${command} needs a scenario FILE`);
  if (extra.length > 0) return fail('', `unexpected argument "${extra[0]}"`);
  if (command === 'check') {
    const stray = (['dt', 'format', 'method'] as const).find((k) => values[k] !== undefined);
    if (stray) return fail(`--${stray}`, `--${stray} belongs to "response", not "check"`);
    return { ok: true, value: { command, file, method: 'closed-form' } };
  }
  const errors: FieldError[] = [];
  let dt = DEFAULT_RESPONSE_DT;
  if (values['dt'] !== undefined) {
    const text = String(values['dt']);
    dt = Number(text);
    if (text.trim() === '' || !Number.isFinite(dt) || dt <= 0) errors.push({ field: '--dt', message: `--dt must be a positive number of seconds, got "${text}"` });
  }
  const format = (values['format'] ?? 'csv') as string;
  if (!(RESPONSE_FORMATS as readonly string[]).includes(format)) errors.push({ field: '--format', message: `--format must be csv or json, got "${format}"` });
  const method = (values['method'] ?? 'closed-form') as string;
  if (!(RESPONSE_METHODS as readonly string[]).includes(method)) errors.push({ field: '--method', message: `--method must be closed-form, sim or both, got "${method}"` });
  if (errors.length > 0) return { ok: false, errors };
  return { ok: true, value: { command, file, dt, format: format as ResponseFormat, method: method as ResponseMethod } };
}

function fail(field: string, message: string): { ok: false; errors: FieldError[] } {
  return { ok: false, errors: [{ field, message }] };
}
