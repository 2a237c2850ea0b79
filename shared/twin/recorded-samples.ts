import { catalogueEntry, rangeViolation } from '../scenario/parameter-catalogue';
import type { RecordedSignal } from '../scenario/recorded-input-schema';
import type { Scenario } from '../scenario/scenario-schema';
import type { FieldError, Parsed } from '../validation/field-errors';

/**
 * The samples behind a recorded input and how they reach the twin. shared/ reads no store: the
 * caller (server, worker, command line) looks the log up and passes its samples through a
 * resolver; withRecordings checks them and attaches them to the scenario the twin runs.
 */

/** One logged signal: times in s from the log's start (strictly increasing), values in SI. */
export interface RecordedSamples {
  readonly t: Float64Array;
  readonly values: Float64Array;
}

/** Finds the samples of one signal of a stored log; undefined when the log or signal is unknown. */
export type RecordingResolver = (logId: string, signal: RecordedSignal) => RecordedSamples | undefined;

/** A scenario with the samples of each recorded input, in the order of `recordedInputs`. */
export type TwinScenario = Scenario & { readonly recordings?: readonly RecordedSamples[] };

/**
 * Most samples one recorded signal may have: 2e6 is over half an hour at 1 kHz. A zero-order
 * hold restarts the integrator at every change, so each sample costs the twin a restart.
 */
export const MAX_RECORDED_SAMPLES = 2_000_000;

const amplitude = catalogueEntry('inputs[].amplitude');

/**
 * What is wrong with a signal's samples, or null: lengths, finite values in the amplitude range,
 * times finite, from 0 on and strictly increasing. The first fault found is named by sample index.
 * @example recordedSamplesProblem({ t: Float64Array.of(0, 0), values: Float64Array.of(1, 2) }) // 'time of sample 1 (0 s) is not after …'
 */
export function recordedSamplesProblem(samples: RecordedSamples): string | null {
  const { t, values } = samples;
  if (!(t instanceof Float64Array) || !(values instanceof Float64Array)) return 'samples must be Float64Arrays of times and values';
  if (t.length !== values.length) return `${t.length} times but ${values.length} values`;
  if (t.length === 0) return 'the signal has no samples';
  if (t.length > MAX_RECORDED_SAMPLES) return `${t.length} samples is more than the ${MAX_RECORDED_SAMPLES} a recorded input may have`;
  for (let i = 0; i < t.length; i++) {
    const ti = t[i]!;
    if (!Number.isFinite(ti)) return `time of sample ${i} is not a finite number`;
    if (i === 0 && ti < 0) return `time of sample 0 (${ti} s) is before the log's start (0 s)`;
    if (i > 0 && !(ti > t[i - 1]!)) return `time of sample ${i} (${ti} s) is not after the one before (${t[i - 1]} s)`;
    const problem = rangeViolation(amplitude, values[i]!);
    if (problem) return `value of sample ${i}: ${problem.replace(/^amplitude /, '')}`;
  }
  return null;
}

/**
 * The scenario with the samples of each recorded input attached, or field errors naming the
 * input whose log or signal is missing or whose samples are bad.
 * @example withRecordings(scenario, (id, signal) => logs.get(id)?.[signal]) // { ok: true, value }
 */
export function withRecordings(scenario: Scenario, resolve: RecordingResolver): Parsed<TwinScenario> {
  const errors: FieldError[] = [];
  const recordings: RecordedSamples[] = [];
  (scenario.recordedInputs ?? []).forEach((term, i) => {
    const field = `recordedInputs.${i}`;
    const samples = resolve(term.logId, term.signal);
    if (!samples) {
      errors.push({ field, message: `log "${term.logId}" has no ${term.signal} signal` });
      return;
    }
    const problem = recordedSamplesProblem(samples);
    if (problem) errors.push({ field, message: `log "${term.logId}", ${term.signal}: ${problem}` });
    else recordings.push(samples);
  });
  return errors.length > 0 ? { ok: false, errors } : { ok: true, value: { ...scenario, recordings } };
}

/** Errors for a scenario whose recorded inputs arrived without their samples (for twinScenarioErrors). */
export function missingRecordingErrors(scenario: TwinScenario): FieldError[] {
  const terms = scenario.recordedInputs ?? [];
  const have = scenario.recordings?.length ?? 0;
  return terms.slice(have).map((term, k) => ({
    field: `recordedInputs.${have + k}`,
    message: `the samples of log "${term.logId}" (${term.signal}) were not given to the twin: resolve them with withRecordings`,
  }));
}
