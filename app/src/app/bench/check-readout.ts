import type { CheckResponse, CheckVerdictBody, ClosedFormResidualBody, LinearRangeBody } from '@kinetwin/shared/protocol/check-api';
import { formatQuantity } from './scenario-facts';

/** One verdict as the checks panel shows it. */
export interface VerdictReadout {
  pass: boolean;
  /** "passes" or "fails". */
  verdict: string;
  /** Worst deviation as a percentage of the peak angle, against the threshold. */
  deviation: string;
  /** The check's own sentence: why it failed, or that it holds. */
  reason: string;
}

/** Everything the checks panel shows of one answer, as text. */
export interface CheckReadout {
  superposition: VerdictReadout;
  shift: VerdictReadout;
  /** The linear range in an engineer's words: how far the closed form can be trusted. */
  linearRange: string;
  /** The search's own summary line, naming the effect that ends the range. */
  linearRangeDetail: string;
  /** Twin against the closed form: RMS, max and when, or why there is none. */
  residual: string;
  residualAvailable: boolean;
  /** How long the checks took on the server. */
  elapsed: string;
}

/**
 * A dimensionless ratio as a percentage: three significant figures from 0.01 %, powers of ten
 * below (a linear twin deviates by ~1e-8 % of its peak).
 * @example formatPercent(1e-4) // "0.01 %"
 */
export function formatPercent(ratio: number): string {
  const percent = ratio * 100;
  if (percent === 0) return '0 %';
  if (Math.abs(percent) >= 0.01) return `${Number(percent.toPrecision(3))} %`;
  return `${percent.toExponential(1)} %`;
}

/**
 * An input scale as a multiple of the scenario's own amplitudes.
 * @example formatScale(0.16962) // "×0.17"
 */
export function formatScale(scale: number): string {
  return `×${Number(scale.toPrecision(2))}`;
}

/** Pass or fail, the worst deviation against the threshold, and the reason. */
export function verdictReadout(check: CheckVerdictBody): VerdictReadout {
  const worst = check.worst === null ? 'unbounded (a run stopped before its horizon)' : `${formatPercent(check.worst)} of the peak angle`;
  return {
    pass: check.pass,
    verdict: check.pass ? 'passes' : 'fails',
    deviation: `worst deviation ${worst}; passes up to ${formatPercent(check.threshold)}`,
    reason: check.reason,
  };
}

/**
 * How far the scenario's inputs may be scaled with the closed form still describing the twin.
 * @example linearRangeText({ scale: 0.17, smallestScale: null, passesAtMax: false, summary: '…', triedScales: [0.001, 1000] })
 * // "The closed form holds up to ×0.17 of this input. This input (×1) is past it: expect the twin to depart from the closed form."
 */
export function linearRangeText(range: LinearRangeBody): string {
  const [lowest, highest] = range.triedScales;
  if (range.passesAtMax && range.smallestScale !== null) {
    return (
      `The closed form holds from ${formatScale(range.smallestScale)} up to at least ${formatScale(highest)} of this input (the largest scale tried); ` +
      `smaller inputs are dominated by a bounded effect such as friction or a dead band.` +
      (range.smallestScale > 1 ? ' This input (×1) is below that: expect the twin to depart from the closed form.' : '')
    );
  }
  if (range.passesAtMax) return `The closed form holds up to at least ${formatScale(highest)} of this input (the largest scale tried), and down to ${formatScale(lowest)}.`;
  if (range.scale === null) return `The closed form does not hold at any scale tried, from ${formatScale(lowest)} to ${formatScale(highest)} of this input.`;
  const here = range.scale >= 1 ? 'This input (×1) is inside it.' : 'This input (×1) is past it: expect the twin to depart from the closed form.';
  return `The closed form holds up to ${formatScale(range.scale)} of this input. ${here}`;
}

/** RMS, max and when of twin − closed form, or why they could not be compared. */
export function residualText(residual: ClosedFormResidualBody): string {
  if (!residual.available) return `No comparison: ${residual.reason}.`;
  const stop = residual.twinStop ? ` The twin stopped early: ${residual.twinStop}.` : '';
  return `RMS ${formatQuantity(residual.rms, 'rad')}, max ${formatQuantity(residual.max, 'rad')} at t = ${formatQuantity(residual.timeOfMax, 's')}.${stop}`;
}

/** The whole answer as the panel's text. */
export function checkReadout(answer: CheckResponse): CheckReadout {
  return {
    superposition: verdictReadout(answer.superposition),
    shift: verdictReadout(answer.shift),
    linearRange: linearRangeText(answer.linearRange),
    linearRangeDetail: answer.linearRange.summary,
    residual: residualText(answer.twinVsClosedForm),
    residualAvailable: answer.twinVsClosedForm.available,
    elapsed: `Checked in ${formatQuantity(answer.elapsedMs / 1000, 's')} on the server.`,
  };
}
