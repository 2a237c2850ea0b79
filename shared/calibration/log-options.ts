import { z } from 'zod';
import { ANGLE_UNITS, LOG_SIGNALS, MAX_COUNTS_PER_REV, TIME_UNITS, TORQUE_UNITS, VELOCITY_UNITS, type LogSignal } from './log-signals';

/**
 * How a log is to be read: what the user confirmed or corrected on the mapping step, and how
 * each kind of mess is treated. Every field has a default, so `{}` reads a tidy SI log with a
 * header; the defaults refuse rather than repair, so nothing changes a log without being asked.
 */

/** Most samples one log may hold: ~33 min at 1 kHz, 80 MB of Float64 for five signals. */
export const LOG_MAX_SAMPLES = 2_000_000;
/** Most columns a log may have; a wider file is not a joint trace. */
export const LOG_MAX_COLUMNS = 256;
/** A step this many times the median step is a gap. */
export const LOG_DEFAULT_GAP_FACTOR = 5;
/** Steps within this fraction of the median step count as uniform sampling (logged times are rounded when printed). */
export const LOG_UNIFORM_TOLERANCE = 0.01;
/** Largest |time| accepted, s: a log stamped with Unix time in ms (~1.8e12) is refused, not misread as decades. */
export const LOG_MAX_ABS_TIME = 1e9;
/** Rows kept as text for the preview table. */
export const LOG_PREVIEW_ROWS = 20;

/** A column given by its zero-based position or by its header text. */
export const columnRefSchema = z.union([
  z.number({ error: 'a column is a zero-based position or a header name' }).int({ error: 'a column position is a whole number' }).min(0, { error: 'a column position is zero or more' }).max(LOG_MAX_COLUMNS - 1, { error: `a column position is below ${LOG_MAX_COLUMNS}` }),
  z.string().trim().min(1, { error: 'a header name is not empty' }).max(200, { error: 'a header name is at most 200 characters' }),
]);
export type ColumnRef = z.infer<typeof columnRefSchema>;

const columnsSchema = z.strictObject(Object.fromEntries(LOG_SIGNALS.map((s) => [s, columnRefSchema.optional()])) as Record<LogSignal, z.ZodOptional<typeof columnRefSchema>>, {
  error: (issue) => (issue.code === 'unrecognized_keys' ? `unknown signal; the signals are ${LOG_SIGNALS.join(', ')}` : 'columns maps signals to columns'),
});

const unitsSchema = z.strictObject(
  {
    time: z.enum(TIME_UNITS, { error: `time is in ${TIME_UNITS.join(' or ')}` }).optional(),
    angle: z.enum(ANGLE_UNITS, { error: `angle is in ${ANGLE_UNITS.join(', ')}` }).optional(),
    velocity: z.enum(VELOCITY_UNITS, { error: `velocity is in ${VELOCITY_UNITS.join(' or ')}` }).optional(),
    setpoint: z.enum(ANGLE_UNITS, { error: `setpoint is in ${ANGLE_UNITS.join(', ')}` }).optional(),
    torque: z.enum(TORQUE_UNITS, { error: `torque is in ${TORQUE_UNITS.join(', ')}` }).optional(),
  },
  { error: (issue) => (issue.code === 'unrecognized_keys' ? `unknown signal; the signals are ${LOG_SIGNALS.join(', ')}` : 'units maps signals to units') },
);

export const logReadOptionsSchema = z.strictObject({
  /** auto: the first row is a header when any of its cells is not a number. */
  header: z.enum(['auto', 'present', 'absent']).default('auto'),
  /** Signal → column. Given, it is the whole mapping; absent, columns are detected from the header (or time, angle by position without one). */
  columns: columnsSchema.optional(),
  /** Signal → unit; a signal not named here takes its header's unit, else SI. */
  units: unitsSchema.optional(),
  countsPerRev: z.number().positive({ error: 'countsPerRev is positive' }).max(MAX_COUNTS_PER_REV, { error: `countsPerRev is at most ${MAX_COUNTS_PER_REV}` }).optional(),
  /** The file reader's: auto detects comma, semicolon or tab from the first lines. */
  separator: z.enum(['auto', ',', ';', '\t']).default('auto'),
  decimalMark: z.enum(['auto', '.', ',']).default('auto'),
  /** An empty or NaN cell in a mapped column: refuse the log, or drop that row (counted in the report). */
  missing: z.enum(['refuse', 'skip-row']).default('refuse'),
  /** A time equal to the previous one: refuse, or keep the first row of that time. */
  duplicateTimes: z.enum(['refuse', 'keep-first']).default('refuse'),
  /** A step over gapFactor × the median step: refuse, or keep it (listed in the report). */
  gaps: z.enum(['refuse', 'allow']).default('refuse'),
  gapFactor: z.number().min(1.5, { error: 'gapFactor is at least 1.5' }).max(1e6, { error: 'gapFactor is at most 1e6' }).default(LOG_DEFAULT_GAP_FACTOR),
  /** Resample onto a uniform grid by linear interpolation: step in s, or "median" for the median step. Off unless asked. */
  resample: z.union([z.literal('median'), z.number().positive({ error: 'resample step is positive (s)' }).max(1e6, { error: 'resample step is at most 1e6 s' })]).optional(),
  maxSamples: z.number().int().min(2, { error: 'maxSamples is at least 2' }).max(LOG_MAX_SAMPLES, { error: `maxSamples is at most ${LOG_MAX_SAMPLES}` }).default(LOG_MAX_SAMPLES),
});

/** Options as a caller writes them (every field optional). */
export type LogReadOptionsInput = z.input<typeof logReadOptionsSchema>;
/** Options with every default filled in. */
export type LogReadOptions = z.output<typeof logReadOptionsSchema>;
