import { performance } from 'node:perf_hooks';
import { sineSweepOfTwin } from '../../shared/frequency/twin-sine-sweep';
import { linearizeAbout, type HoldingMode } from '../../shared/linearize/operating-point';
import { operatingRange } from '../../shared/linearize/operating-range';
import type { CheckResponse, OperatingRangeResponse, SineSweepResponse } from '../../shared/protocol/check-api';
import type { Scenario } from '../../shared/scenario/scenario-schema';
import type { FieldError } from '../../shared/validation/field-errors';
import { runChecks } from './run-checks';

/**
 * The batch work the pool's threads run, each kind a pure function of its (already validated)
 * input. Errors a request can cause come back as field errors, not exceptions, so the route
 * answers 400 and the thread is reused.
 */
export type BatchTask =
  | { kind: 'checks'; scenario: Scenario }
  | { kind: 'sine-sweep'; scenario: Scenario; frequencies: number[]; channel: 'reference' | 'torque'; amplitude: number }
  | { kind: 'operating-range'; scenario: Scenario; angle: number; holding: HoldingMode; tolerance: number };

export type BatchKind = BatchTask['kind'];

/** What each kind answers. */
export interface BatchResults {
  checks: CheckResponse;
  'sine-sweep': SineSweepResponse | { errors: FieldError[] };
  'operating-range': OperatingRangeResponse | { errors: FieldError[] };
}

const elapsed = (started: number) => Math.round((performance.now() - started) * 10) / 10;

function sineSweep(task: Extract<BatchTask, { kind: 'sine-sweep' }>): BatchResults['sine-sweep'] {
  const started = performance.now();
  const sweep = sineSweepOfTwin(task.scenario, { frequencies: task.frequencies, channel: task.channel, amplitude: task.amplitude });
  if (!sweep.ok) return { errors: sweep.errors };
  return { ...sweep.value, elapsedMs: elapsed(started) };
}

function operatingRangeOf(task: Extract<BatchTask, { kind: 'operating-range' }>): BatchResults['operating-range'] {
  const started = performance.now();
  const pair = linearizeAbout(task.scenario, { angle: task.angle, holding: task.holding });
  if (!pair.ok) return { errors: pair.errors };
  const range = pair.value.moves.length > 0 ? operatingRange(pair.value, { tolerance: task.tolerance }) : null;
  if (range && !range.ok) return { errors: range.errors };
  const { linear, effectiveStiffness, holdingTorque, notes } = pair.value;
  return { linear, effectiveStiffness, holdingTorque, notes, range: range ? { tolerance: task.tolerance, ...range.value } : null, elapsedMs: elapsed(started) };
}

/** Runs one task; the worker thread's whole job. */
export function runBatchTask(task: BatchTask): BatchResults[BatchKind] {
  switch (task.kind) {
    case 'checks':
      return runChecks(task.scenario);
    case 'sine-sweep':
      return sineSweep(task);
    case 'operating-range':
      return operatingRangeOf(task);
  }
}
