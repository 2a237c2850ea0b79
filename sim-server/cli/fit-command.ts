import type { LogTable } from '../../shared/calibration/log-builder';
import type { LogReadOptionsInput } from '../../shared/calibration/log-options';
import { fitTwin, type FitReport } from '../../shared/calibration/fit-twin';
import type { RecordedInput, RecordedSignal } from '../../shared/scenario/recorded-input-schema';
import type { Scenario } from '../../shared/scenario/scenario-schema';
import { withRecordings } from '../../shared/twin/recorded-samples';
import type { FieldError } from '../../shared/validation/field-errors';
import type { ReadLogFileResult } from '../logs/read-log-file';
import { EXIT_INVALID_INPUT, EXIT_OK, EXIT_TWIN_STOPPED } from './check-command';
import type { FitCliCommand } from './fit-arguments';

/**
 * `kinetwin fit`: the log read (sim-server/logs/read-log-file.ts), its time base moved to start at
 * 0, its torque and set-point columns replayed as the scenario's recorded inputs (or, when the
 * scenario names recorded inputs itself, each filled from this log by its signal), the fit run,
 * and the report printed as JSON with each parameter under its name.
 */

export type ReadLog = (path: string, options: LogReadOptionsInput) => Promise<ReadLogFileResult>;

export type FitCommandResult =
  | { exitCode: typeof EXIT_OK; document: Record<string, unknown> }
  | { exitCode: typeof EXIT_INVALID_INPUT | typeof EXIT_TWIN_STOPPED; what: string; errors: FieldError[] };

const REPLAYED: readonly RecordedSignal[] = ['torque', 'setpoint'];

/** The recorded inputs the fit replays: the scenario's own, or one per replayable column of the log. */
function recordedInputsFor(scenario: Scenario, table: LogTable, cmd: FitCliCommand): RecordedInput[] {
  if ((scenario.recordedInputs ?? []).length > 0) return scenario.recordedInputs!;
  return REPLAYED.filter((signal) => table[signal] !== undefined).map((signal) => ({
    channel: signal === 'torque' ? 'torque' : 'reference',
    logId: cmd.log,
    signal,
    hold: cmd.hold,
    delay: 0,
  }));
}

/** The JSON document: parameters under their names, then the fit's figures and warnings. */
export function fitDocument(report: FitReport, notes: readonly string[], log: { samples: number; notes: readonly string[] }): Record<string, unknown> {
  const doc: Record<string, unknown> = {};
  for (const p of report.parameters) doc[p.name] = { value: p.value, low: p.low, high: p.high, standardError: p.standardError, unit: p.unit, start: p.start };
  Object.assign(doc, {
    rms: report.angle.rms,
    r2: report.angle.r2,
    largestResidual: report.angle.largest,
    largestResidualAt: report.angle.largestAt,
    velocity: report.velocity,
    status: report.status,
    iterations: report.iterations,
    twinRuns: report.evaluations,
    window: report.window,
    degreesOfFreedom: report.degreesOfFreedom,
    intervals: report.intervalMethod,
    correlation: { order: report.parameters.map((p) => p.name), matrix: report.correlation },
    warnings: [...report.warnings, ...notes],
    log,
  });
  return doc;
}

export async function runFitCommand(cmd: FitCliCommand, scenario: Scenario, readLog: ReadLog): Promise<FitCommandResult> {
  const read = await readLog(cmd.log, cmd.logOptions);
  if (!read.ok) {
    const { row, column, reason } = read.error;
    const where = [row === null ? null : `row ${row}`, column].filter((x) => x !== null).join(', ');
    return { exitCode: EXIT_INVALID_INPUT, what: `bad log ${cmd.log}`, errors: [{ field: where || 'LOG', message: reason }] };
  }
  const table = read.table;
  if (!table.angle) return { exitCode: EXIT_INVALID_INPUT, what: `bad log ${cmd.log}`, errors: [{ field: '--columns', message: 'the fit needs a measured angle column (e.g. --columns t=time,angle=angle)' }] };
  // The log's own time stamps may start anywhere; the run starts at its first sample.
  const t0 = table.time[0]!;
  const t = table.time.map((x) => x - t0);
  const recordedInputs = recordedInputsFor(scenario, table, cmd);
  const notes: string[] = [];
  if (scenario.inputs.length > 0) notes.push(`the scenario's own ${scenario.inputs.length} input term(s) act too, beside the logged ${recordedInputs.map((r) => r.signal).join(' and ') || 'nothing'}`);
  if (recordedInputs.length === 0) notes.push('the log has no torque or set-point column: the twin moves from its initial state and the scenario\'s own inputs only');
  const attached = withRecordings({ ...scenario, recordedInputs }, (_logId, signal) => (table[signal] ? { t, values: table[signal]! } : undefined));
  if (!attached.ok) return { exitCode: EXIT_INVALID_INPUT, what: `cannot replay ${cmd.log}`, errors: attached.errors };
  const report = fitTwin({
    scenario: attached.value,
    measured: { t, angle: table.angle, ...(table.velocity ? { velocity: table.velocity } : {}) },
    parameters: cmd.params,
    ...(cmd.window ? { window: cmd.window } : {}),
    initialState: cmd.initial,
  });
  if (!report.ok) {
    const stopped = report.errors.some((e) => e.message.startsWith('the model cannot be evaluated'));
    return { exitCode: stopped ? EXIT_TWIN_STOPPED : EXIT_INVALID_INPUT, what: `cannot fit ${cmd.file} to ${cmd.log}`, errors: report.errors };
  }
  return { exitCode: EXIT_OK, document: fitDocument(report.value, notes, { samples: read.report.samples, notes: read.report.notes }) };
}
