import { parseArgs } from 'node:util';
import { DEFAULT_FREQUENCY_GRID } from '../../shared/frequency/frequency-grid';
import { GAIN_MAP_METHODS, type GainMapMethod } from '../../shared/gain-map/cell-metrics';
import { MAP_GAINS } from '../../shared/gain-map/gain-axes';
import type { AxisRequest, GainMapRequest } from '../../shared/gain-map/gain-map-request';
import { type FieldError, type Parsed } from '../../shared/validation/field-errors';
import { FIT_OPTIONS, parseFitArguments, type FitCliCommand } from './fit-arguments';

/** Output spacing of `kinetwin response` when --dt is not given, s. */
export const DEFAULT_RESPONSE_DT = 0.001;
export const RESPONSE_FORMATS = ['csv', 'json'] as const;
export type ResponseFormat = (typeof RESPONSE_FORMATS)[number];
/** Where the numbers come from: the closed form, the simulated twin, or both side by side. */
export const RESPONSE_METHODS = ['closed-form', 'sim', 'both'] as const;
export type ResponseMethod = (typeof RESPONSE_METHODS)[number];
/** The closed form's frequency response, or that and the twin's measured by injected sines. */
export const FREQUENCY_METHODS = ['closed-form', 'sim'] as const;
export type FrequencyMethod = (typeof FREQUENCY_METHODS)[number];
/** What `kinetwin time` times: the closed form's solve and grid, or the twin's run on the grid. */
export const TIME_METHODS = ['closed-form', 'sim'] as const;
export type TimeMethod = (typeof TIME_METHODS)[number];
/** Timed runs of `kinetwin time` when --runs is not given, and the most it takes. */
export const DEFAULT_TIME_RUNS = 200;
export const MAX_TIME_RUNS = 100_000;

export type CliCommand =
  | { command: 'response'; file: string; dt: number; format: ResponseFormat; method: ResponseMethod }
  | { command: 'check'; file: string; method: ResponseMethod }
  | {
      command: 'frequency';
      file: string;
      from: number;
      to: number;
      points: number;
      format: ResponseFormat;
      method: FrequencyMethod;
      /** sim only: the path measured and the injected sine's amplitude (null: from the scenario). */
      channel: 'reference' | 'torque' | null;
      amplitude: number | null;
    }
  | { command: 'time'; file: string; dt: number; method: TimeMethod; runs: number }
  | { command: 'linearize'; file: string; angle: number; holding: 'feed-forward' | 'disturbance'; tolerance: number }
  | { command: 'sweep'; file: string; request: GainMapRequest; method: GainMapMethod; format: ResponseFormat }
  | FitCliCommand
  | { command: 'help' };

const COMMANDS = ['response', 'check', 'frequency', 'time', 'linearize', 'sweep', 'fit'] as const;
const COMMAND_LIST = '"response", "check", "frequency", "time", "linearize", "sweep" or "fit"';
/** Default agreement for `kinetwin linearize`'s operating range: 1 % of the peak. */
export const DEFAULT_LINEARIZE_TOLERANCE = 0.01;
/** Options that belong to one command only; the others refuse them by name. */
const OWN_OPTIONS = { response: ['dt', 'method'], check: [], frequency: ['from', 'to', 'points', 'method', 'channel', 'amplitude'], time: ['dt', 'method', 'runs'], linearize: ['angle', 'holding', 'tolerance'], sweep: ['x', 'y', 'z', 'log', 'method'], fit: FIT_OPTIONS } as const;

export const USAGE = `usage:
  kinetwin response FILE [--dt 0.001] [--format csv|json] [--method closed-form|sim|both]
      angle and velocity of a scenario on 0, dt, …, horizon: from the closed form (default),
      the simulated twin, or both with the residual twin − closed form
  kinetwin check FILE
      poles, theorem verdicts, step metrics, superposition and shift checks and the linear range
      as JSON; exit 1 when the scenario's limits are not met
  kinetwin frequency FILE [--from 0.1] [--to 1000] [--points 200] [--format csv|json]
                 [--method closed-form|sim] [--channel reference|torque] [--amplitude A]
      magnitude (dB) and phase (degrees) of the loop, reference-to-angle and torque-to-angle on
      log-spaced rad/s, with gain and phase margins, crossovers, bandwidth and the verdicts;
      --method sim adds the twin's response measured by injected sines of amplitude A
  kinetwin time FILE [--method closed-form|sim] [--dt 0.001] [--runs 200]
      times the work of "response" on the grid (after warm-up, in one process) and prints JSON:
      method, runs, median_ms, p10_ms, p90_ms, samples
  kinetwin linearize FILE --angle THETA0 [--holding feed-forward|disturbance] [--tolerance 0.01]
      the linear model of a gravity-loaded joint about THETA0 (rad, or e.g. 60deg) as a scenario
      file, with its effective stiffness, holding torque and the largest move for which it
      agrees with the twin within the tolerance (a fraction of the peak)
  kinetwin sweep FILE --x GAIN:MIN:MAX:COUNT --y GAIN:MIN:MAX:COUNT [--z GAIN:VALUE] [--log x|y]
                 [--method closed-form|sim] [--format json|csv]
      a gain map: two of ${MAP_GAINS.join(', ')} swept over MIN … MAX in COUNT steps (2 to 200;
      --log x or y spaces that axis in log10, repeat for both), the third gain fixed with --z;
      each cell by the closed form (default) or the twin; JSON (default): the axes, a matrix per
      metric (rows along y, columns along x, null where undefined) and the suggested cell;
      CSV: one row per cell; exit 1 when the scenario sets limits and no cell meets them all
  kinetwin fit SCENARIO LOG.csv --params inertia,damping,stiffness[,coulombFriction,staticFriction,torqueOffset,inputDelay]
                 [--columns t=time,angle=angle,torque=torque] [--units angle=deg,t=ms] [--counts-per-rev N]
                 [--window 0:5] [--initial log|scenario] [--hold zoh|linear]
      fits the twin's parameters to the log's angle (and velocity, where mapped) with the log's torque
      or set-point replayed as recorded inputs, from the scenario's values; prints JSON with each
      parameter's value and 95 % interval (low, high) under its name, rms, r2 and warnings;
      --window in s from the log's first sample; --initial log starts from the first measured angle
exit codes: 0 ok, 1 limits not met (check, sweep), 2 invalid input (a bad log names its row), 3 the twin stopped early (what it has is printed)`;

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
        from: { type: 'string' },
        to: { type: 'string' },
        points: { type: 'string' },
        channel: { type: 'string' },
        amplitude: { type: 'string' },
        runs: { type: 'string' },
        angle: { type: 'string' },
        holding: { type: 'string' },
        tolerance: { type: 'string' },
        x: { type: 'string' },
        y: { type: 'string' },
        z: { type: 'string' },
        log: { type: 'string', multiple: true },
        params: { type: 'string' },
        columns: { type: 'string' },
        units: { type: 'string' },
        window: { type: 'string' },
        initial: { type: 'string' },
        hold: { type: 'string' },
        'counts-per-rev': { type: 'string' },
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
  if (positionals.length === 0) return fail('command', `a command is needed: ${COMMAND_LIST}`);
  const [command, file, ...rest] = positionals;
  if (!(COMMANDS as readonly string[]).includes(command!)) return fail('command', `unknown command "${command}": use ${COMMAND_LIST}`);
  const name = command as (typeof COMMANDS)[number];
  if (file === undefined) return fail('FILE', `${name} needs a scenario FILE`);
  // fit takes the log as a second file.
  const extra = name === 'fit' ? rest.slice(1) : rest;
  if (extra.length > 0) return fail('', `unexpected argument "${extra[0]}"`);
  for (const other of COMMANDS) {
    if (other === name) continue;
    const stray = (OWN_OPTIONS[other] as readonly string[]).find((k) => values[k] !== undefined && !(OWN_OPTIONS[name] as readonly string[]).includes(k));
    if (stray) return fail(`--${stray}`, `--${stray} belongs to "${other}", not "${name}"`);
  }
  if (name === 'check') {
    if (values['format'] !== undefined) return fail('--format', '--format belongs to "response" and "frequency", not "check"');
    return { ok: true, value: { command: name, file, method: 'closed-form' } };
  }
  if (name === 'frequency') return frequencyCommand(file, values);
  if (name === 'time') return timeCommand(file, values);
  if (name === 'linearize') return linearizeCommand(file, values);
  if (name === 'sweep') return sweepCommand(file, values);
  if (name === 'fit') return parseFitArguments(file, rest[0], values);
  const errors: FieldError[] = [];
  const dt = dtOption(values, errors);
  const format = (values['format'] ?? 'csv') as string;
  if (!(RESPONSE_FORMATS as readonly string[]).includes(format)) errors.push({ field: '--format', message: `--format must be csv or json, got "${format}"` });
  const method = (values['method'] ?? 'closed-form') as string;
  if (!(RESPONSE_METHODS as readonly string[]).includes(method)) errors.push({ field: '--method', message: `--method must be closed-form, sim or both, got "${method}"` });
  if (errors.length > 0) return { ok: false, errors };
  return { ok: true, value: { command: 'response', file, dt, format: format as ResponseFormat, method: method as ResponseMethod } };
}

/** --dt in seconds (DEFAULT_RESPONSE_DT when absent); a bad value adds its error. */
function dtOption(values: Record<string, unknown>, errors: FieldError[]): number {
  if (values['dt'] === undefined) return DEFAULT_RESPONSE_DT;
  const text = String(values['dt']);
  const dt = Number(text);
  if (text.trim() === '' || !Number.isFinite(dt) || dt <= 0) errors.push({ field: '--dt', message: `--dt must be a positive number of seconds, got "${text}"` });
  return dt;
}

function linearizeCommand(file: string, values: Record<string, unknown>): Parsed<CliCommand> {
  const errors: FieldError[] = [];
  let angle = NaN;
  if (values['angle'] === undefined) errors.push({ field: '--angle', message: 'linearize needs the operating angle: --angle 1.05 (rad) or --angle 60deg' });
  else {
    const text = String(values['angle']).trim();
    const m = /^(.+?)(deg)?$/.exec(text);
    const x = m && m[1]!.trim() !== '' ? Number(m[1]) : NaN;
    if (!Number.isFinite(x)) errors.push({ field: '--angle', message: `--angle must be an angle in rad or with "deg", got "${text}"` });
    else angle = m![2] ? (x * Math.PI) / 180 : x;
  }
  const holding = (values['holding'] ?? 'feed-forward') as string;
  if (holding !== 'feed-forward' && holding !== 'disturbance') errors.push({ field: '--holding', message: `--holding must be feed-forward or disturbance, got "${holding}"` });
  let tolerance = DEFAULT_LINEARIZE_TOLERANCE;
  if (values['tolerance'] !== undefined) {
    const text = String(values['tolerance']);
    tolerance = Number(text);
    if (!(tolerance > 0 && tolerance < 1)) errors.push({ field: '--tolerance', message: `--tolerance must be a fraction between 0 and 1 (0.01 is 1 %), got "${text}"` });
  }
  for (const k of ['format', 'dt', 'method'] as const) if (values[k] !== undefined) errors.push({ field: `--${k}`, message: `--${k} does not apply to linearize, which prints JSON` });
  if (errors.length > 0) return { ok: false, errors };
  return { ok: true, value: { command: 'linearize', file, angle, holding: holding as 'feed-forward' | 'disturbance', tolerance } };
}

function timeCommand(file: string, values: Record<string, unknown>): Parsed<CliCommand> {
  const errors: FieldError[] = [];
  const dt = dtOption(values, errors);
  const method = (values['method'] ?? 'closed-form') as string;
  if (!(TIME_METHODS as readonly string[]).includes(method)) errors.push({ field: '--method', message: `--method must be closed-form or sim for time, got "${method}"` });
  let runs = DEFAULT_TIME_RUNS;
  if (values['runs'] !== undefined) {
    const text = String(values['runs']);
    runs = Number(text);
    if (!Number.isInteger(runs) || runs < 1 || runs > MAX_TIME_RUNS) errors.push({ field: '--runs', message: `--runs must be a whole number from 1 to ${MAX_TIME_RUNS}, got "${text}"` });
  }
  if (values['format'] !== undefined) errors.push({ field: '--format', message: '--format belongs to "response" and "frequency"; time prints JSON' });
  if (errors.length > 0) return { ok: false, errors };
  return { ok: true, value: { command: 'time', file, dt, method: method as TimeMethod, runs } };
}

function frequencyCommand(file: string, values: Record<string, unknown>): Parsed<CliCommand> {
  const errors: FieldError[] = [];
  const numberOption = (key: 'from' | 'to' | 'points' | 'amplitude', fallback: number): number => {
    if (values[key] === undefined) return fallback;
    const text = String(values[key]);
    const x = Number(text);
    if (text.trim() === '' || !Number.isFinite(x)) errors.push({ field: `--${key}`, message: `--${key} must be a number, got "${text}"` });
    return x;
  };
  const from = numberOption('from', DEFAULT_FREQUENCY_GRID.from);
  const to = numberOption('to', DEFAULT_FREQUENCY_GRID.to);
  const points = numberOption('points', DEFAULT_FREQUENCY_GRID.points);
  const format = (values['format'] ?? 'csv') as string;
  if (!(RESPONSE_FORMATS as readonly string[]).includes(format)) errors.push({ field: '--format', message: `--format must be csv or json, got "${format}"` });
  const method = (values['method'] ?? 'closed-form') as string;
  if (!(FREQUENCY_METHODS as readonly string[]).includes(method)) errors.push({ field: '--method', message: `--method must be closed-form or sim for frequency, got "${method}"` });
  const channel = values['channel'] === undefined ? null : String(values['channel']);
  if (channel !== null && channel !== 'reference' && channel !== 'torque') errors.push({ field: '--channel', message: `--channel must be reference or torque, got "${channel}"` });
  const amplitude = values['amplitude'] === undefined ? null : numberOption('amplitude', NaN);
  if (amplitude !== null && Number.isFinite(amplitude) && amplitude <= 0) errors.push({ field: '--amplitude', message: `--amplitude must be positive, got ${amplitude}` });
  if (method !== 'sim') {
    for (const k of ['channel', 'amplitude'] as const) if (values[k] !== undefined) errors.push({ field: `--${k}`, message: `--${k} sets the injected sine of --method sim` });
  }
  if (errors.length > 0) return { ok: false, errors };
  return {
    ok: true,
    value: { command: 'frequency', file, from, to, points, format: format as ResponseFormat, method: method as FrequencyMethod, channel: channel as 'reference' | 'torque' | null, amplitude },
  };
}

/** GAIN:MIN:MAX:COUNT of --x or --y; ranges are checked against the catalogue later (planGainMap). */
function axisOption(key: 'x' | 'y', values: Record<string, unknown>, log: readonly string[], errors: FieldError[]): AxisRequest | null {
  const text = values[key] === undefined ? undefined : String(values[key]);
  if (text === undefined) {
    errors.push({ field: `--${key}`, message: `sweep needs --${key} GAIN:MIN:MAX:COUNT, e.g. --${key} ${key === 'x' ? 'kp:0:50:40' : 'kd:0:5:40'}` });
    return null;
  }
  const parts = text.split(':');
  const [gain, min, max, count] = [parts[0]!.trim(), Number(parts[1]), Number(parts[2]), Number(parts[3])];
  const blank = parts.slice(1).some((p) => p.trim() === '');
  if (parts.length !== 4 || blank) errors.push({ field: `--${key}`, message: `--${key} must be GAIN:MIN:MAX:COUNT, got "${text}"` });
  else if (!MAP_GAINS.includes(gain)) errors.push({ field: `--${key}`, message: `--${key} sweeps one of ${MAP_GAINS.join(', ')}, got "${gain}"` });
  else if (!Number.isFinite(min) || !Number.isFinite(max)) errors.push({ field: `--${key}`, message: `--${key} needs finite MIN and MAX, got "${text}"` });
  else if (!Number.isInteger(count)) errors.push({ field: `--${key}`, message: `--${key} needs a whole COUNT, got "${parts[3]}"` });
  else return { gain, min, max, count, spacing: log.includes(key) ? 'log' : 'linear' };
  return null;
}

function sweepCommand(file: string, values: Record<string, unknown>): Parsed<CliCommand> {
  const errors: FieldError[] = [];
  const log = ((values['log'] as string[] | undefined) ?? []).flatMap((v) => v.split(',')).map((v) => v.trim());
  const badLog = log.find((v) => v !== 'x' && v !== 'y');
  if (badLog !== undefined) errors.push({ field: '--log', message: `--log must be x or y (repeat it for both), got "${badLog}"` });
  const x = axisOption('x', values, log, errors);
  const y = axisOption('y', values, log, errors);
  let z: GainMapRequest['z'] = null;
  if (values['z'] !== undefined) {
    const text = String(values['z']);
    const parts = text.split(':');
    const value = Number(parts[1]);
    if (parts.length !== 2 || parts[1]!.trim() === '' || !Number.isFinite(value)) errors.push({ field: '--z', message: `--z must be GAIN:VALUE, got "${text}"` });
    else if (!MAP_GAINS.includes(parts[0]!.trim())) errors.push({ field: '--z', message: `--z fixes one of ${MAP_GAINS.join(', ')}, got "${parts[0]}"` });
    else z = { gain: parts[0]!.trim(), value };
  }
  const method = (values['method'] ?? 'closed-form') as string;
  if (!(GAIN_MAP_METHODS as readonly string[]).includes(method)) errors.push({ field: '--method', message: `--method must be closed-form or sim for sweep, got "${method}"` });
  const format = (values['format'] ?? 'json') as string;
  if (!(RESPONSE_FORMATS as readonly string[]).includes(format)) errors.push({ field: '--format', message: `--format must be csv or json, got "${format}"` });
  if (errors.length > 0 || !x || !y) return { ok: false, errors };
  return { ok: true, value: { command: 'sweep', file, request: { x, y, z }, method: method as GainMapMethod, format: format as ResponseFormat } };
}

function fail(field: string, message: string): { ok: false; errors: FieldError[] } {
  return { ok: false, errors: [{ field, message }] };
}
