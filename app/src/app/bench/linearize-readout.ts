import type { LinearizedJoint } from '@kinetwin/shared/linearize/operating-point';
import type { OperatingRangeResponse } from '@kinetwin/shared/protocol/check-api';
import { formatPercent, formatScale } from './check-readout';
import { formatDegrees, UNSTABLE_PLANT_NOTE } from './frequency-readout';
import { formatQuantity } from './scenario-facts';

/** The linear model about θ0 in words, computed in the browser. */
export interface LinearModelReadout {
  stiffness: string;
  holdingTorque: string;
  /** Who supplies the holding torque. */
  holdingDetail: string;
  notes: string[];
  /** Shown when the linear joint is unstable without its loop. */
  caution: string | null;
}

export const UNSTABLE_LINEAR_CAUTION =
  'Caution: about this angle the joint tips away by itself (its effective stiffness is below zero), an unstable plant: only the loop holds it at θ0, and a drive limit or a lost loop lets it fall.';

const degrees = (rad: number) => formatDegrees((rad * 180) / Math.PI);

/** Effective stiffness, holding torque, the notes and the caution of one linearization. */
export function linearModelReadout(model: LinearizedJoint, feedForward: boolean): LinearModelReadout {
  return {
    stiffness: formatQuantity(model.effectiveStiffness, 'N·m/rad'),
    holdingTorque: formatQuantity(model.holdingTorque, 'N·m'),
    holdingDetail: feedForward ? 'supplied by the drive as a feed-forward: θ0 is an equilibrium' : 'left to the loop: the linear model carries it as a constant torque from t = 0',
    notes: model.notes,
    caution: model.notes.some((note) => note.includes(UNSTABLE_PLANT_NOTE)) ? UNSTABLE_LINEAR_CAUTION : null,
  };
}

/**
 * How far the linear model holds, from the operating-range answer: the largest move (rad and
 * degrees) and scale of the scenario's own moves, or why there is none; then the search's summary.
 */
export function operatingRangeText(answer: OperatingRangeResponse): { headline: string; summary: string | null } {
  const range = answer.range;
  if (range === null) return { headline: 'The scenario has no inputs to grow: give it a move (a reference or torque term) to find how far the linear model holds.', summary: null };
  const within = `within ${formatPercent(range.tolerance)} of the peak`;
  if (range.scale === null || range.largestMove === null) return { headline: `The linear model and the twin do not agree ${within} at any scale of the moves tried.`, summary: range.summary };
  const move = `${formatQuantity(range.largestMove, 'rad')} (${degrees(range.largestMove)})`;
  const from = range.smallestScale !== null ? ` from ${formatScale(range.smallestScale)}` : '';
  return { headline: `The linear model holds ${within} for moves up to ${move} from θ0: ${formatScale(range.scale)} of the scenario's moves${from}.`, summary: range.summary };
}
