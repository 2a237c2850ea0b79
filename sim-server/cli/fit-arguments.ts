import { FIT_PARAMETER_NAMES, isFitParameterName, type FitParameterName } from '../../shared/calibration/fit-parameters';
import type { LogReadOptionsInput } from '../../shared/calibration/log-options';
import { RECORDED_HOLDS, type RecordedHold } from '../../shared/scenario/recorded-input-schema';
import type { FieldError, Parsed } from '../../shared/validation/field-errors';

/**
 * The options of `kinetwin fit SCENARIO LOG.csv`: which parameters, how the log's columns map to
 * signals and in which units, the window, the initial state, and the hold of the replayed input.
 */

export interface FitCliCommand {
  command: 'fit';
  file: string;
  log: string;
  params: FitParameterName[];
  /** What the log reader is told: the mapping and units from --columns and --units. */
  logOptions: LogReadOptionsInput;
  /** Seconds from the log's first sample; null: the whole log. */
  window: { start: number; end: number } | null;
  initial: 'log' | 'scenario';
  hold: RecordedHold;
}

/** Options that belong to `fit` alone. */
export const FIT_OPTIONS = ['params', 'columns', 'units', 'window', 'initial', 'hold', 'counts-per-rev'] as const;

/** Names a user may write for each log signal. */
const SIGNAL_ALIASES: Readonly<Record<string, 'time' | 'angle' | 'velocity' | 'setpoint' | 'torque'>> = {
  t: 'time',
  time: 'time',
  angle: 'angle',
  velocity: 'velocity',
  setpoint: 'setpoint',
  'set-point': 'setpoint',
  torque: 'torque',
};
/** Unit spellings a terminal can type, to the log reader's. */
const UNIT_ALIASES: Readonly<Record<string, string>> = { nm: 'N·m', 'n·m': 'N·m', 'n.m': 'N·m', 'n*m': 'N·m' };

/** `a=b,c=d` into pairs, or the error naming the option. */
function pairs(option: string, text: string, errors: FieldError[]): [string, string][] {
  const out: [string, string][] = [];
  for (const part of text.split(',')) {
    const m = /^\s*([^=\s]+)\s*=\s*(.+?)\s*$/.exec(part);
    if (!m) {
      errors.push({ field: `--${option}`, message: `--${option} takes signal=value pairs separated by commas (e.g. t=time,angle=angle), got "${part}"` });
      continue;
    }
    const signal = SIGNAL_ALIASES[m[1]!.toLowerCase()];
    if (!signal) {
      errors.push({ field: `--${option}`, message: `unknown signal "${m[1]}" in --${option}: use t, angle, velocity, setpoint or torque` });
      continue;
    }
    out.push([signal, m[2]!]);
  }
  return out;
}

export function parseFitArguments(file: string, log: string | undefined, values: Record<string, unknown>): Parsed<FitCliCommand> {
  const errors: FieldError[] = [];
  if (log === undefined) return { ok: false, errors: [{ field: 'LOG', message: 'fit needs a SCENARIO file and a LOG.csv file' }] };
  const params: FitParameterName[] = [];
  if (values['params'] === undefined) errors.push({ field: '--params', message: `fit needs --params, some of ${FIT_PARAMETER_NAMES.join(',')}` });
  else {
    for (const name of String(values['params']).split(',').map((s) => s.trim())) {
      if (!isFitParameterName(name)) errors.push({ field: '--params', message: `"${name}" is not a fittable parameter: use ${FIT_PARAMETER_NAMES.join(', ')}` });
      else if (params.includes(name)) errors.push({ field: '--params', message: `"${name}" is named twice` });
      else params.push(name);
    }
  }
  const logOptions: LogReadOptionsInput = {};
  if (values['columns'] !== undefined) {
    const columns: Record<string, string | number> = {};
    for (const [signal, ref] of pairs('columns', String(values['columns']), errors)) columns[signal] = /^\d+$/.test(ref) ? Number(ref) : ref;
    logOptions.columns = columns;
  }
  if (values['units'] !== undefined) {
    const units: Record<string, string> = {};
    for (const [signal, unit] of pairs('units', String(values['units']), errors)) units[signal] = UNIT_ALIASES[unit.toLowerCase()] ?? unit;
    logOptions.units = units as LogReadOptionsInput['units'];
  }
  if (values['counts-per-rev'] !== undefined) {
    const text = String(values['counts-per-rev']);
    const counts = Number(text);
    if (!(counts > 0) || !Number.isFinite(counts)) errors.push({ field: '--counts-per-rev', message: `--counts-per-rev must be a positive number, got "${text}"` });
    else logOptions.countsPerRev = counts;
  }
  let window: FitCliCommand['window'] = null;
  if (values['window'] !== undefined) {
    const text = String(values['window']);
    const m = /^\s*([^:]+):([^:]+)\s*$/.exec(text);
    const start = m ? Number(m[1]) : NaN;
    const end = m ? Number(m[2]) : NaN;
    if (!Number.isFinite(start) || !Number.isFinite(end) || start < 0 || !(start < end)) {
      errors.push({ field: '--window', message: `--window must be START:END in seconds from the log's first sample, START ≥ 0 and before END (e.g. 0:5), got "${text}"` });
    } else window = { start, end };
  }
  const initial = String(values['initial'] ?? 'log');
  if (initial !== 'log' && initial !== 'scenario') errors.push({ field: '--initial', message: `--initial must be log or scenario, got "${initial}"` });
  const hold = String(values['hold'] ?? 'zoh');
  if (!(RECORDED_HOLDS as readonly string[]).includes(hold)) errors.push({ field: '--hold', message: `--hold must be ${RECORDED_HOLDS.join(' or ')}, got "${hold}"` });
  for (const k of ['format', 'dt', 'method'] as const) if (values[k] !== undefined) errors.push({ field: `--${k}`, message: `--${k} does not apply to fit, which prints JSON` });
  if (errors.length > 0) return { ok: false, errors };
  return { ok: true, value: { command: 'fit', file, log, params, logOptions, window, initial: initial as 'log' | 'scenario', hold: hold as RecordedHold } };
}
