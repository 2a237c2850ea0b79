import type { FrequencyResponse } from '@kinetwin/shared/frequency/frequency-response';
import type { SineSweepResponse } from '@kinetwin/shared/protocol/check-api';
import { valueAtFrequency } from './bode-figure';
import { formatPercent } from './check-readout';
import { formatDegrees, PATH_NAMES } from './frequency-readout';
import { formatQuantity } from './scenario-facts';

/** The closed-form path a sweep's channel measures. */
export type MeasuredPath = 'referenceToAngle' | 'torqueToAngle';

/** The measured points as the Bode chart draws them: markers over their path's curves. */
export interface MeasuredOverlay {
  path: MeasuredPath;
  frequency: number[];
  magnitudeDb: (number | null)[];
  phaseDeg: (number | null)[];
  distortion: (number | null)[];
  /** The draft changed since the measurement: drawn faded. */
  stale: boolean;
}

/** One measured frequency as the read-out table shows it. */
export interface MeasuredRow {
  key: string;
  frequency: string;
  magnitude: string;
  closedFormMagnitude: string;
  /** measured − closed form, dB. */
  magnitudeGap: string;
  phase: string;
  closedFormPhase: string;
  phaseGap: string;
  distortion: string;
  /** "torque limit", "stuck": what acted during the measured periods. */
  flags: string[];
}

/** A frequency the twin gave no figure for, and why. */
export interface UnmeasuredRow {
  key: string;
  frequency: string;
  reason: string;
}

export interface SweepReadout {
  /** Which path, at what amplitude, how many points and how long it took. */
  summary: string;
  rows: MeasuredRow[];
  unmeasured: UnmeasuredRow[];
  overlay: MeasuredOverlay;
}

export const pathOfChannel = (channel: 'reference' | 'torque'): MeasuredPath => (channel === 'reference' ? 'referenceToAngle' : 'torqueToAngle');

const gap = (measured: number, closed: number | null, unit: (x: number) => string) => (closed === null ? '—' : unit(measured - closed));
const signed = (text: string) => (text.startsWith('-') ? text : `+${text}`);

/**
 * The measured sweep beside the closed form of the same path at the same frequencies (`closedForm`
 * computed on the sweep's own grid, or null when the draft has none): per point the measured
 * magnitude and phase, the closed form's, the gap, the distortion and the flags; the points
 * without a figure listed with their reason.
 */
export function sweepReadout(answer: SineSweepResponse, closedForm: FrequencyResponse | null, stale = false): SweepReadout {
  const path = pathOfChannel(answer.channel);
  const series = closedForm?.[path] ?? null;
  const at = (values: readonly (number | null)[] | undefined, w: number) => (closedForm && values ? valueAtFrequency(closedForm.frequency, values, w) : null);
  const rows: MeasuredRow[] = [];
  const unmeasured: UnmeasuredRow[] = [];
  answer.points.forEach((point, i) => {
    const key = String(i);
    const frequency = formatQuantity(point.frequency, 'rad/s');
    if (point.magnitudeDb === null || point.phaseDeg === null) {
      unmeasured.push({ key, frequency, reason: point.reason ?? 'no figure' });
      return;
    }
    const cfMagnitude = at(series?.magnitudeDb, point.frequency);
    const cfPhase = at(series?.phaseDeg, point.frequency);
    rows.push({
      key,
      frequency,
      magnitude: formatQuantity(point.magnitudeDb, 'dB'),
      closedFormMagnitude: cfMagnitude === null ? '—' : formatQuantity(cfMagnitude, 'dB'),
      magnitudeGap: gap(point.magnitudeDb, cfMagnitude, (x) => signed(formatQuantity(x, 'dB'))),
      phase: formatDegrees(point.phaseDeg),
      closedFormPhase: cfPhase === null ? '—' : formatDegrees(cfPhase),
      phaseGap: gap(point.phaseDeg, cfPhase, (x) => signed(formatDegrees(x))),
      distortion: point.distortion === null ? '—' : formatPercent(point.distortion),
      flags: [...(point.saturated ? ['torque limit'] : []), ...(point.stuck ? ['stuck'] : [])],
    });
  });
  const unit = answer.channel === 'reference' ? 'rad' : 'N·m';
  const measured = answer.points.length - unmeasured.length;
  return {
    summary:
      `${PATH_NAMES[path]}, a sine of ${formatQuantity(answer.amplitude, unit)} on the ${answer.channel}: ` +
      `${measured} of ${answer.points.length} frequencies measured in ${formatQuantity(answer.elapsedMs / 1000, 's')} on the server.`,
    rows,
    unmeasured,
    overlay: {
      path,
      frequency: answer.points.map((p) => p.frequency),
      magnitudeDb: answer.points.map((p) => p.magnitudeDb),
      phaseDeg: answer.points.map((p) => p.phaseDeg),
      distortion: answer.points.map((p) => p.distortion),
      stale,
    },
  };
}
