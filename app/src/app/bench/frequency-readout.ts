import type { FrequencyResponse } from '@kinetwin/shared/frequency/frequency-response';
import type { LoopStability } from '@kinetwin/shared/frequency/stability-margins';
import { formatQuantity } from './scenario-facts';

/** One margin as the frequency panel shows it: the figure and where it is read. */
export interface MarginReadout {
  key: 'gainMargin' | 'phaseMargin' | 'bandwidth';
  label: string;
  /** The figure with its unit, or why there is none ("unbounded", "none"). */
  value: string;
  /** Where it is read, e.g. "at the phase crossover, 31.62 rad/s". */
  detail: string;
  /** False where the figure is undefined. */
  defined: boolean;
}

/** How the verdict reads at a glance. */
export type VerdictTone = 'good' | 'bad' | 'unsure' | 'neutral';

/** Everything the frequency panel says in words about one response. */
export interface FrequencyReadout {
  stability: LoopStability;
  tone: VerdictTone;
  /** The stability verdict: the response's first note. */
  verdict: string;
  /** Every other note, in the response's order. */
  notes: string[];
  /** Gain margin, phase margin and bandwidth; empty in open loop, where the verdict says why. */
  margins: MarginReadout[];
  /** Shown when a note says the plant is unstable without its loop. */
  caution: string | null;
  /** How a sampled controller's delays are modelled; null for a continuous loop. */
  delayModel: string | null;
  /** Which transfer paths the chart draws. */
  paths: string;
}

/** The shared words for a plant unstable on its own (shared/frequency/stability-margins.ts, shared/linearize/operating-point.ts). */
export const UNSTABLE_PLANT_NOTE = 'the open-loop plant is unstable';

export const UNSTABLE_PLANT_CAUTION =
  'Caution: the joint is unstable without its loop. Read the stability verdict, not the margins: positive gain and phase margins do not make this loop stable.';

/** Names of the three transfer paths, as the legend and the read-out use them. */
export const PATH_NAMES = {
  loop: 'loop L(jω)',
  referenceToAngle: 'reference → angle',
  torqueToAngle: 'torque → angle',
} as const;

const TONE: Record<LoopStability, VerdictTone> = {
  stable: 'good',
  marginal: 'bad',
  unstable: 'bad',
  undetermined: 'unsure',
  'no-loop': 'neutral',
};

/**
 * A frequency in rad/s, noting when it lies outside the grid the chart draws (the margins are
 * searched well beyond it).
 */
function frequencyText(w: number, frequency: readonly number[]): string {
  const inside = frequency.length > 0 && w >= frequency[0]! && w <= frequency[frequency.length - 1]!;
  return `${formatQuantity(w, 'rad/s')}${inside ? '' : ' (outside the plotted range)'}`;
}

/**
 * A phase in degrees, with the degree sign against the number as is usual.
 * @example formatDegrees(72.593) // "72.59°"
 */
export function formatDegrees(value: number): string {
  return `${formatQuantity(value)}°`;
}

function marginsOf(response: FrequencyResponse): MarginReadout[] {
  const m = response.margins;
  const f = response.frequency;
  return [
    m.gainMarginDb !== null && m.phaseCrossover !== null
      ? { key: 'gainMargin', label: 'Gain margin', value: formatQuantity(m.gainMarginDb, 'dB'), detail: `at the phase crossover, ${frequencyText(m.phaseCrossover, f)}`, defined: true }
      : { key: 'gainMargin', label: 'Gain margin', value: 'unbounded', detail: 'no phase crossover', defined: false },
    m.phaseMarginDeg !== null && m.gainCrossover !== null
      ? { key: 'phaseMargin', label: 'Phase margin', value: formatDegrees(m.phaseMarginDeg), detail: `at the gain crossover, ${frequencyText(m.gainCrossover, f)}`, defined: true }
      : { key: 'phaseMargin', label: 'Phase margin', value: 'none', detail: 'no gain crossover', defined: false },
    m.bandwidth !== null
      ? { key: 'bandwidth', label: 'Bandwidth', value: frequencyText(m.bandwidth, f), detail: `where ${PATH_NAMES.referenceToAngle} is 3 dB below its value at 0`, defined: true }
      : { key: 'bandwidth', label: 'Bandwidth', value: 'none', detail: `${PATH_NAMES.referenceToAngle} has no −3 dB point`, defined: false },
  ];
}

/** The frequency response in words: verdict, margins, notes, caution and delay model. */
export function frequencyReadout(response: FrequencyResponse): FrequencyReadout {
  const [verdict = response.stability, ...notes] = response.notes;
  const openLoop = response.loop === null;
  return {
    stability: response.stability,
    tone: TONE[response.stability],
    verdict,
    notes,
    margins: openLoop ? [] : marginsOf(response),
    caution: response.notes.some((note) => note.includes(UNSTABLE_PLANT_NOTE)) ? UNSTABLE_PLANT_CAUTION : null,
    delayModel: response.delayModel,
    paths: openLoop
      ? `Open loop: only ${PATH_NAMES.torqueToAngle} is drawn (the joint itself); there is no loop to break and no reference path.`
      : `Drawn: ${PATH_NAMES.loop} broken at the drive, ${PATH_NAMES.referenceToAngle} and ${PATH_NAMES.torqueToAngle} of the closed loop.`,
  };
}
