import { parseArgs } from 'node:util';
import { type FieldError, type Parsed } from '../../shared/validation/field-errors';

/** Output spacing of `kinetwin response` when --dt is not given, s. */
export const DEFAULT_RESPONSE_DT = 0.001;
export const RESPONSE_FORMATS = ['csv', 'json'] as const;
export type ResponseFormat = (typeof RESPONSE_FORMATS)[number];
/**
 * Where the numbers come from. Only the closed form exists today; the simulation twin adds
 * "sim" and "both" here (and an entry in response-sources.ts) without touching the commands.
 */
export const RESPONSE_METHODS = ['closed-form'] as const;
export type ResponseMethod = (typeof RESPONSE_METHODS)[number];

export type CliCommand =
  | { command: 'response'; file: string; dt: number; format: ResponseFormat; method: ResponseMethod }
  | { command: 'check'; file: string; method: ResponseMethod }
  | { command: 'help' };

export const USAGE = `usage:
  kinetwin response FILE [--dt 0.001] [--format csv|json]
      closed-form angle and velocity of a scenario on 0, dt, …, horizon
  kinetwin check FILE
      poles, theorem verdicts and step metrics as JSON; exit 1 when the scenario's limits are not met
exit codes: 0 ok, 1 limits not met (check), 2 invalid input`;

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
  const method: ResponseMethod = 'closed-form';
  if (command === 'check') {
    const stray = (['dt', 'format'] as const).find((k) => values[k] !== undefined);
    if (stray) return fail(`--${stray}`, `--${stray} belongs to "response", not "check"`);
    return { ok: true, value: { command, file, method } };
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
  if (errors.length > 0) return { ok: false, errors };
  return { ok: true, value: { command, file, dt, format: format as ResponseFormat, method } };
}

function fail(field: string, message: string): { ok: false; errors: FieldError[] } {
  return { ok: false, errors: [{ field, message }] };
}
