import { frequencyResponseOf } from '../../shared/frequency/frequency-response';
import { defaultSweepAmplitude, defaultSweepChannel, sineSweepOfTwin } from '../../shared/frequency/twin-sine-sweep';
import { linearizeAbout } from '../../shared/linearize/operating-point';
import { operatingRange } from '../../shared/linearize/operating-range';
import { parseScenarioText } from '../../shared/scenario/parse-scenario';
import { describeFieldErrors, type FieldError } from '../../shared/validation/field-errors';
import { twinScenarioErrors } from '../../shared/twin/twin-scenario-errors';
import { DEFAULT_RESPONSE_DT, parseCliArguments, USAGE } from './cli-arguments';
import { checkReport, EXIT_INVALID_INPUT, EXIT_OK, EXIT_TWIN_STOPPED } from './check-command';
import { frequencyOutput, frequencySummary, measuredSeries, type MeasuredSeries } from './frequency-command';
import { checkGridSize, responseChunks } from './response-command';
import { responseWork, timeWork } from './time-command';
import { solveByMethod } from './response-sources';
import { sweepOutput } from './sweep-command';
import { evaluateCells } from '../../shared/gain-map/evaluate-cells';
import { planGainMap } from '../../shared/gain-map/gain-map-plan';
import { summarizeGainMap } from '../../shared/gain-map/gain-map-result';
import { SAFETY_CAUTION } from '../../shared/protocol/library-api';
import { runFitCommand, type ReadLog } from './fit-command';
import { readLogFile } from '../logs/read-log-file';

/** What the command line touches, passed in so the whole flow runs in tests without a process. */
export interface CliIo {
  readText(path: string): Promise<string>;
  /** Resolves once the chunk is handed off (honours back-pressure). */
  writeOut(chunk: string): Promise<void>;
  writeErr(text: string): void;
  /** Reads a CSV log (fit); the streamed file reader when not given. */
  readLog?: ReadLog;
}

/**
 * Runs `kinetwin` with the given arguments and returns the exit code: 0 ok, 1 limits not met
 * (check), 2 invalid input — arguments, an unreadable file, or a scenario the engine refuses,
 * reported with the field and the reason on stderr (and as JSON on stdout for check) — and 3
 * when the twin stopped at a bound before the horizon: a truncated trace is not a success.
 */
export async function runCli(argv: readonly string[], io: CliIo): Promise<number> {
  const args = parseCliArguments(argv);
  if (!args.ok) return invalid(io, 'invalid arguments', args.errors, false, `\n${USAGE}`);
  const cmd = args.value;
  if (cmd.command === 'help') {
    await io.writeOut(`${USAGE}\n`);
    return EXIT_OK;
  }
  const asJson = cmd.command === 'check';
  let text: string;
  try {
    text = await io.readText(cmd.file);
  } catch (err) {
    return invalid(io, `cannot read ${cmd.file}`, [{ field: 'FILE', message: (err as Error).message }], asJson);
  }
  const scenario = parseScenarioText(text);
  if (!scenario.ok) return invalid(io, `invalid scenario ${cmd.file}`, scenario.errors, asJson);
  if (cmd.command === 'check') {
    const solved = solveByMethod('closed-form', scenario.value, DEFAULT_RESPONSE_DT);
    if (!solved.ok) return invalid(io, `cannot solve ${cmd.file}`, solved.errors, asJson);
    const twinErrors = twinScenarioErrors(scenario.value);
    if (twinErrors.length > 0) return invalid(io, `the twin cannot run ${cmd.file}`, twinErrors, asJson);
    const report = checkReport(scenario.value, solved.value);
    await io.writeOut(`${JSON.stringify(report.document, null, 2)}\n`);
    return report.exitCode;
  }
  if (cmd.command === 'frequency') {
    const response = frequencyResponseOf(scenario.value, { from: cmd.from, to: cmd.to, points: cmd.points });
    if (!response.ok) return invalid(io, 'invalid arguments', response.errors.map((e) => ({ ...e, field: `--${e.field}` })), false);
    let measured: MeasuredSeries | null = null;
    if (cmd.method === 'sim') {
      const twinErrors = twinScenarioErrors(scenario.value);
      if (twinErrors.length > 0) return invalid(io, `the twin cannot run ${cmd.file}`, twinErrors, false);
      const channel = cmd.channel ?? defaultSweepChannel(scenario.value);
      const sweep = sineSweepOfTwin(scenario.value, { frequencies: response.value.frequency, channel, amplitude: cmd.amplitude ?? defaultSweepAmplitude(scenario.value, channel) });
      if (!sweep.ok) return invalid(io, `the twin's response of ${cmd.file} cannot be measured`, sweep.errors.map((e) => ({ ...e, field: e.field === 'frequencies' ? '--points' : e.field ? `--${e.field}` : '' })), false);
      measured = measuredSeries(sweep.value);
    }
    await io.writeOut(frequencyOutput(response.value, cmd.format, measured));
    if (cmd.format === 'csv') io.writeErr(`kinetwin: ${frequencySummary(response.value)}\n`);
    const missing = measured?.reason.findIndex((r) => r !== null) ?? -1;
    if (missing < 0) return EXIT_OK;
    io.writeErr(`kinetwin: the twin has no figure at ${response.value.frequency[missing]} rad/s: ${measured!.reason[missing]}\n`);
    return EXIT_TWIN_STOPPED;
  }
  if (cmd.command === 'linearize') {
    const pair = linearizeAbout(scenario.value, { angle: cmd.angle, holding: cmd.holding });
    if (!pair.ok) return invalid(io, `cannot linearize ${cmd.file}`, pair.errors.map((e) => (e.field === 'angle' || e.field === 'holding' ? { ...e, field: `--${e.field}` } : e)), false);
    const twinErrors = twinScenarioErrors(pair.value.nonlinear);
    if (twinErrors.length > 0) return invalid(io, `the twin cannot run ${cmd.file}`, twinErrors, false);
    const range = pair.value.moves.length > 0 ? operatingRange(pair.value, { tolerance: cmd.tolerance }) : null;
    if (range && !range.ok) return invalid(io, `cannot compare the linear model of ${cmd.file} with the twin`, range.errors, false);
    const { linear, effectiveStiffness, holdingTorque, notes } = pair.value;
    const doc = { scenario: linear, operatingAngle: cmd.angle, holding: cmd.holding, effectiveStiffness, holdingTorque, notes, range: range ? { tolerance: cmd.tolerance, ...range.value } : null };
    await io.writeOut(`${JSON.stringify(doc, null, 2)}\n`);
    return EXIT_OK;
  }
  if (cmd.command === 'fit') {
    const fitted = await runFitCommand(cmd, scenario.value, io.readLog ?? readLogFile);
    if (fitted.exitCode === EXIT_OK) {
      await io.writeOut(`${JSON.stringify(fitted.document, null, 2)}\n`);
      return EXIT_OK;
    }
    await invalid(io, fitted.what, fitted.errors, false);
    return fitted.exitCode;
  }
  if (cmd.command === 'time') {
    const grid = checkGridSize(cmd.dt, scenario.value.horizon);
    if (!grid.ok) return invalid(io, 'invalid arguments', grid.errors, false);
    const work = responseWork(scenario.value, cmd.method, cmd.dt);
    if (!work.ok) return invalid(io, `cannot solve ${cmd.file}`, work.errors, false);
    const timed = timeWork(work.value, cmd.method, cmd.runs);
    if (!timed.ok) {
      io.writeErr(`kinetwin: ${timed.reason}; nothing was timed\n`);
      return EXIT_TWIN_STOPPED;
    }
    await io.writeOut(`${JSON.stringify(timed.report, null, 2)}\n`);
    return EXIT_OK;
  }
  if (cmd.command === 'sweep') {
    const plan = planGainMap(scenario.value, cmd.request);
    // The request's fields are the options': x.min and x.count both come from --x.
    if (!plan.ok) return invalid(io, 'invalid arguments', plan.errors.map((e) => (/^[xyz]\b/.test(e.field) ? { ...e, field: `--${e.field[0]}`, message: `${e.field}: ${e.message}` } : e)), false);
    const indices = Array.from({ length: plan.value.cells }, (_, i) => i);
    const cells = evaluateCells(scenario.value, plan.value, cmd.method, indices);
    if (!cells.ok) return invalid(io, `${cmd.method === 'sim' ? 'the twin cannot run' : 'cannot map'} ${cmd.file}`, cells.errors, false);
    const map = summarizeGainMap(scenario.value, plan.value, cmd.method, cells.value);
    const out = sweepOutput(scenario.value, plan.value, map, cells.value, cmd.format);
    await io.writeOut(out.text);
    if (cmd.format === 'csv') io.writeErr(`kinetwin: ${map.statement}. ${SAFETY_CAUTION}\n`);
    return out.exitCode;
  }
  // Size the grid before solving: a twin run on a too-fine grid would cost minutes and memory.
  const grid = checkGridSize(cmd.dt, scenario.value.horizon);
  if (!grid.ok) return invalid(io, 'invalid arguments', grid.errors, false);
  const solved = solveByMethod(cmd.method, scenario.value, cmd.dt);
  if (!solved.ok) return invalid(io, `cannot solve ${cmd.file}`, solved.errors, asJson);
  const chunks = responseChunks(solved.value, cmd.dt, cmd.format, scenario.value.horizon);
  if (!chunks.ok) return invalid(io, 'invalid arguments', chunks.errors, false);
  for (const chunk of chunks.value) await io.writeOut(chunk);
  const stop = solved.value.twin?.stop;
  if (!stop) return EXIT_OK;
  io.writeErr(`kinetwin: the twin stopped early at t = ${stop.time.toFixed(4)} s of ${scenario.value.horizon} s: ${stop.message}; the samples up to there are printed\n`);
  return EXIT_TWIN_STOPPED;
}

async function invalid(io: CliIo, what: string, errors: FieldError[], asJson: boolean, extra = ''): Promise<number> {
  io.writeErr(`kinetwin: ${what}: ${describeFieldErrors(errors)}${extra}\n`);
  if (asJson) await io.writeOut(`${JSON.stringify({ valid: false, errors }, null, 2)}\n`);
  return EXIT_INVALID_INPUT;
}
