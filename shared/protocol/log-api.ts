import { z } from 'zod';
import type { LogDetected, LogReport } from '../calibration/log-builder';
import type { LogError } from '../calibration/log-mapping';
import { logReadOptionsSchema } from '../calibration/log-options';
import type { LogSeparator } from '../calibration/log-separator';
import type { MeasuredSignal } from '../calibration/log-signals';
import type { Parsed } from '../validation/field-errors';
import { fieldErrorsOf } from '../validation/field-errors';

/**
 * The logged-trace API (issue 12): upload a CSV log to a scenario (preview, then save with the
 * confirmed mapping), list a scenario's logs, download one as CSV, delete one. Uploads are
 * multipart/form-data with one file part, `file`, and the text fields below.
 */

/** Form field that carries the log file. */
export const LOG_FILE_FIELD = 'file';
export const MAX_LOG_NAME_LENGTH = 120;
/** The options field is JSON text of a few hundred bytes; this bounds a hostile one. */
export const MAX_LOG_OPTIONS_LENGTH = 16_000;
/** Points per signal in a preview's plot, evenly spaced over the log (the first and last included). */
export const LOG_PREVIEW_POINTS = 1000;

/** The text fields of an upload, as multer hands them over. */
export const logUploadFieldsSchema = z.strictObject(
  {
    name: z
      .string({ error: 'name must be text' })
      .trim()
      .min(1, { error: 'name must not be empty' })
      .max(MAX_LOG_NAME_LENGTH, { error: `name must be at most ${MAX_LOG_NAME_LENGTH} characters` })
      .optional(),
    /** JSON of the reading options (LogReadOptionsInput): mapping, units, policies. */
    options: z.string({ error: 'options must be JSON text' }).max(MAX_LOG_OPTIONS_LENGTH, { error: `options must be at most ${MAX_LOG_OPTIONS_LENGTH} characters` }).optional(),
  },
  { error: (issue) => (issue.code === 'unrecognized_keys' ? `unknown field; an upload sends ${LOG_FILE_FIELD}, name and options` : 'the upload fields are not valid') },
);

export interface LogUploadFields {
  name: string | undefined;
  options: z.output<typeof logReadOptionsSchema>;
}

/** The upload's text fields checked, with `options` parsed from JSON and checked too (errors name options.<field>). */
export function parseLogUploadFields(input: unknown): Parsed<LogUploadFields> {
  const fields = logUploadFieldsSchema.safeParse(input ?? {});
  if (!fields.success) return { ok: false, errors: fieldErrorsOf(fields.error, input) };
  let raw: unknown = {};
  if (fields.data.options !== undefined) {
    try {
      raw = JSON.parse(fields.data.options);
    } catch {
      return { ok: false, errors: [{ field: 'options', message: 'options is not valid JSON' }] };
    }
  }
  const options = logReadOptionsSchema.safeParse(raw);
  if (!options.success) return { ok: false, errors: fieldErrorsOf(options.error, raw).map((e) => ({ field: e.field ? `options.${e.field}` : 'options', message: e.message })) };
  return { ok: true, value: { name: fields.data.name, options: options.data } };
}

/** The reader's report as stored and sent: the builder's, plus how the file was written. */
export type StoredLogReport = LogReport & { file: { separator: LogSeparator; lineEnding: 'crlf' | 'lf' | 'cr' | null; bytes: number } };

/** A log in a list: everything but its samples. */
export interface JointLogSummary {
  id: number;
  scenarioId: number;
  name: string;
  fileName: string;
  owner: { id: number; displayName: string };
  sampleCount: number;
  /** The signals it holds besides time. */
  signals: MeasuredSignal[];
  /** First and last time, s, and the median step. */
  start: number;
  end: number;
  medianStep: number;
  hasFit: boolean;
  createdAt: string;
  /** Whether the signed-in user may delete it (its owner only). */
  canDelete: boolean;
}

export interface JointLogList {
  items: JointLogSummary[];
}

/** A signal thinned for the preview's plot: times and values at the same LOG_PREVIEW_POINTS indices. */
export interface PreviewSeries {
  time: number[];
  values: Partial<Record<MeasuredSignal, number[]>>;
}

/**
 * POST …/logs/preview's answer: nothing is saved. A file the reader refuses still answers 200
 * with ok: false, so the mapping step can show what was found next to the problem.
 */
export type LogPreview =
  | { ok: true; detected: LogDetected; report: StoredLogReport; series: PreviewSeries }
  | { ok: false; detected: LogDetected | null; error: LogError; message: string };

/** One line for a refusal: "row 4, column 2 ("angle"): "x" is not a number". */
export function describeLogError(error: LogError): string {
  const where = [error.row === null ? null : `row ${error.row}`, error.column].filter((p) => p !== null).join(', ');
  return where ? `${where}: ${error.reason}` : error.reason;
}
