import { type FrequencyResponse } from '../../shared/frequency/frequency-response';
import { type SineSweepResult } from '../../shared/frequency/twin-sine-sweep';

const CSV_COLUMNS = [
  ['loopMagnitudeDb', (r: FrequencyResponse) => r.loop?.magnitudeDb],
  ['loopPhaseDeg', (r: FrequencyResponse) => r.loop?.phaseDeg],
  ['referenceToAngleMagnitudeDb', (r: FrequencyResponse) => r.referenceToAngle?.magnitudeDb],
  ['referenceToAnglePhaseDeg', (r: FrequencyResponse) => r.referenceToAngle?.phaseDeg],
  ['torqueToAngleMagnitudeDb', (r: FrequencyResponse) => r.torqueToAngle.magnitudeDb],
  ['torqueToAnglePhaseDeg', (r: FrequencyResponse) => r.torqueToAngle.phaseDeg],
] as const;

/** The twin's measured response on the same frequencies, column by column. */
export interface MeasuredSeries {
  channel: 'reference' | 'torque';
  amplitude: number;
  magnitudeDb: (number | null)[];
  phaseDeg: (number | null)[];
  distortion: (number | null)[];
  saturated: boolean[];
  stuck: boolean[];
  /** Why a frequency has no figure, or null. */
  reason: (string | null)[];
}

/** A sweep's points as parallel arrays beside the closed form's. */
export function measuredSeries(sweep: SineSweepResult): MeasuredSeries {
  const p = sweep.points;
  return {
    channel: sweep.channel,
    amplitude: sweep.amplitude,
    magnitudeDb: p.map((x) => x.magnitudeDb),
    phaseDeg: p.map((x) => x.phaseDeg),
    distortion: p.map((x) => x.distortion),
    saturated: p.map((x) => x.saturated),
    stuck: p.map((x) => x.stuck),
    reason: p.map((x) => x.reason),
  };
}

/**
 * `kinetwin frequency` as text. JSON: frequency (rad/s), loop, referenceToAngle and torqueToAngle
 * ({magnitudeDb, phaseDeg}, null in open loop for the first two), margins, stability, notes and
 * delayModel, and with --method sim `measured` (MeasuredSeries). CSV: one row per frequency; a
 * path that does not exist or a value that is 0 or unbounded leaves its cell empty.
 */
export function frequencyOutput(r: FrequencyResponse, format: 'csv' | 'json', measured: MeasuredSeries | null = null): string {
  if (format === 'json') return `${JSON.stringify(measured ? { ...r, measured } : r, null, 2)}\n`;
  const cell = (v: number | null | undefined) => (v === null || v === undefined ? '' : String(v));
  const header = ['frequency', ...CSV_COLUMNS.map(([name]) => name), ...(measured ? ['measuredMagnitudeDb', 'measuredPhaseDeg', 'measuredDistortion'] : [])];
  const rows = [header.join(',')];
  r.frequency.forEach((w, i) => {
    const cells = CSV_COLUMNS.map(([, series]) => cell(series(r)?.[i]));
    if (measured) cells.push(cell(measured.magnitudeDb[i]), cell(measured.phaseDeg[i]), cell(measured.distortion[i]));
    rows.push([String(w), ...cells].join(','));
  });
  return `${rows.join('\n')}\n`;
}

const fixed = (x: number | null, digits: number, unit: string) => (x === null ? 'none' : `${x.toFixed(digits)} ${unit}`);

/** One line for stderr beside the CSV: the verdicts and margins a reader looks for first. */
export function frequencySummary(r: FrequencyResponse): string {
  const m = r.margins;
  const at = (w: number | null) => (w === null ? '' : ` at ${w.toPrecision(4)} rad/s`);
  return [
    r.notes.join('; '),
    `gain margin ${fixed(m.gainMarginDb, 2, 'dB')}${at(m.phaseCrossover)}`,
    `phase margin ${fixed(m.phaseMarginDeg, 2, '°')}${at(m.gainCrossover)}`,
    `bandwidth ${m.bandwidth === null ? 'none' : `${m.bandwidth.toPrecision(4)} rad/s`}`,
    ...(r.delayModel ? [r.delayModel] : []),
  ].join('; ');
}
