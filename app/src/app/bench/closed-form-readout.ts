import type { ClosedFormSolution, PoleSummary, StepMetrics } from '@kinetwin/shared/closed-form/index';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import { type LimitedMetric, limitVerdicts } from '@kinetwin/shared/scenario/limit-verdicts';
import { formatQuantity, formatResult } from './scenario-facts';

/** One step metric with the scenario's limit beside it and the textbook estimate where there is one. */
export interface MetricRow {
  key: keyof StepMetrics;
  label: string;
  value: string;
  /** The limit as text, null when the scenario sets none. */
  limit: string | null;
  /** Whether the limit is met; null when there is no limit. */
  met: boolean | null;
}

/** A dominant-pair estimate beside the exact closed-form value. */
export interface EstimateRow {
  key: string;
  label: string;
  exact: string;
  estimate: string;
}

/** The closed form in words and numbers, ready for the bench panel. */
export interface ClosedFormReadout {
  poles: { key: string; text: string }[];
  stability: string;
  dcGain: { key: string; label: string; value: string }[];
  finalValue: { applies: boolean; text: string };
  initialValue: { applies: boolean; reason: string | null; angle: { before: string; after: string }; velocity: { before: string; after: string } };
  metrics: MetricRow[];
  metricsReason: string | null;
  dominantPair: { zeta: string; naturalFrequency: string; dampedFrequency: string; dominant: boolean; estimates: EstimateRow[] } | null;
  notes: string[];
}

const STABILITY_TEXT: Record<ClosedFormSolution['stability'], string> = {
  stable: 'stable: every pole lies left of the imaginary axis',
  marginal: 'marginally stable: a pole on the imaginary axis, none to its right',
  unstable: 'unstable: a pole right of the imaginary axis or repeated on it',
};

/**
 * A pole as "re ± im j" (the conjugate pair on one line), with its multiplicity when above one.
 * @example poleText({ re: -2, im: 3, multiplicity: 1 }) // "-2 ± 3j rad/s"
 */
export function poleText(pole: PoleSummary): string {
  const re = formatResult(pole.re);
  const value = pole.im === 0 ? re : `${re} ± ${formatResult(Math.abs(pole.im))}j`;
  return pole.multiplicity > 1 ? `${value} rad/s (×${pole.multiplicity})` : `${value} rad/s`;
}

function quantityOrUndefined(value: number | null, unit: string): string {
  return value === null ? 'undefined' : formatResult(value, unit);
}

const METRICS: { key: keyof StepMetrics; label: string; unit: string; limit: LimitedMetric | null }[] = [
  { key: 'riseTime', label: 'Rise time 10–90 %', unit: 's', limit: null },
  { key: 'overshootPercent', label: 'Overshoot', unit: '%', limit: 'overshootPercent' },
  { key: 'peakTime', label: 'Peak time', unit: 's', limit: null },
  { key: 'settlingTime', label: 'Settling time 2 %', unit: 's', limit: 'settlingTime' },
  { key: 'steadyStateError', label: 'Steady-state error', unit: 'rad', limit: 'steadyStateError' },
];

/** Keys of the `nonlinear` block that switch an effect on when set (antiWindup, computeDelay and the seed only modify others). */
const NONLINEAR_EFFECTS = ['torqueLimit', 'coulombFriction', 'staticFriction', 'gravity', 'deadBand', 'encoderCounts', 'noiseStdDev'] as const;

/**
 * A note naming the nonlinear effects the twin adds and the closed form leaves out; null when none is on.
 * @example nonlinearNote({ ...scenario, nonlinear: { torqueLimit: 2 } }) // "The twin adds torqueLimit; …"
 */
export function nonlinearNote(scenario: Scenario): string | null {
  const block = scenario.nonlinear as Record<string, unknown>;
  const on = NONLINEAR_EFFECTS.filter((key) => {
    const value = block[key];
    return value !== undefined && value !== null && value !== 0 && value !== false;
  });
  return on.length === 0 ? null : `The twin adds ${on.join(', ')}; the closed form is the linear joint, so expect a residual between them.`;
}

/** Builds the panel's readout from a solution of `scenario` (its `limits` are judged here). */
export function closedFormReadout(solution: ClosedFormSolution, scenario: Scenario): ClosedFormReadout {
  const verdicts = limitVerdicts(scenario.limits, solution.metrics);
  const openLoop = scenario.controller.mode === 'open-loop';
  const { initialValue: initial, metrics, dominantPair: pair } = solution;
  const nonlinear = nonlinearNote(scenario);
  return {
    // A complex pair is listed once, as re ± im j.
    poles: solution.poles.filter((pole) => pole.im >= 0).map((pole, index) => ({ key: `${index}`, text: poleText(pole) })),
    stability: STABILITY_TEXT[solution.stability],
    dcGain: [
      {
        key: 'reference',
        label: 'θ per unit reference',
        value: openLoop ? 'none: no reference in open loop' : solution.dcGain.reference === null ? 'unbounded' : formatResult(solution.dcGain.reference, 'rad/rad'),
      },
      {
        key: 'torque',
        label: 'θ per unit torque',
        value: solution.dcGain.torque === null ? 'unbounded: a pole at s = 0' : formatResult(solution.dcGain.torque, 'rad/(N·m)'),
      },
    ],
    finalValue:
      solution.finalValue.applies && solution.finalValue.value !== null
        ? { applies: true, text: formatResult(solution.finalValue.value, 'rad') }
        : { applies: false, text: `Does not apply: ${solution.finalValue.reason ?? 'the theorem gives no value here'}` },
    initialValue: {
      applies: initial.applies,
      reason: initial.reason,
      angle: { before: formatQuantity(initial.before.angle, 'rad'), after: quantityOrUndefined(initial.angle, 'rad') },
      velocity: { before: formatQuantity(initial.before.velocity, 'rad/s'), after: quantityOrUndefined(initial.velocity, 'rad/s') },
    },
    metrics: METRICS.map(({ key, label, unit, limit }) => {
      const verdict = limit ? verdicts[limit] : undefined;
      return {
        key,
        label,
        value: quantityOrUndefined(metrics[key], unit),
        limit: verdict ? `≤ ${formatQuantity(verdict.bound, unit)}` : null,
        met: verdict ? verdict.met : null,
      };
    }),
    metricsReason: solution.metricsReason,
    dominantPair: pair && {
      zeta: formatQuantity(pair.zeta),
      naturalFrequency: formatQuantity(pair.naturalFrequency, 'rad/s'),
      dampedFrequency: formatQuantity(pair.dampedFrequency, 'rad/s'),
      dominant: pair.dominant,
      estimates: [
        { key: 'overshoot', label: 'Overshoot', exact: quantityOrUndefined(metrics.overshootPercent, '%'), estimate: formatQuantity(pair.estimates.overshootPercent, '%') },
        { key: 'peak', label: 'Peak time', exact: quantityOrUndefined(metrics.peakTime, 's'), estimate: formatQuantity(pair.estimates.peakTime, 's') },
        { key: 'settling', label: 'Settling time', exact: quantityOrUndefined(metrics.settlingTime, 's'), estimate: formatQuantity(pair.estimates.settlingTime, 's') },
        { key: 'rise', label: 'Rise time', exact: quantityOrUndefined(metrics.riseTime, 's'), estimate: formatQuantity(pair.estimates.riseTime, 's') },
      ],
    },
    notes: nonlinear ? [...solution.notes, nonlinear] : solution.notes,
  };
}
