import { type FrequencyResponse } from '../../shared/frequency/frequency-response';

const CSV_COLUMNS = [
  ['loopMagnitudeDb', (r: FrequencyResponse) => r.loop?.magnitudeDb],
  ['loopPhaseDeg', (r: FrequencyResponse) => r.loop?.phaseDeg],
  ['referenceToAngleMagnitudeDb', (r: FrequencyResponse) => r.referenceToAngle?.magnitudeDb],
  ['referenceToAnglePhaseDeg', (r: FrequencyResponse) => r.referenceToAngle?.phaseDeg],
  ['torqueToAngleMagnitudeDb', (r: FrequencyResponse) => r.torqueToAngle.magnitudeDb],
  ['torqueToAnglePhaseDeg', (r: FrequencyResponse) => r.torqueToAngle.phaseDeg],
] as const;

/**
 * `kinetwin frequency` as text. JSON: frequency (rad/s), loop, referenceToAngle and torqueToAngle
 * ({magnitudeDb, phaseDeg}, null in open loop for the first two), margins, stability, notes and
 * delayModel. CSV: one row per frequency; a path that does not exist or a value that is 0 or
 * unbounded leaves its cell empty.
 */
export function frequencyOutput(r: FrequencyResponse, format: 'csv' | 'json'): string {
  if (format === 'json') return `${JSON.stringify(r, null, 2)}\n`;
  const rows = [['frequency', ...CSV_COLUMNS.map(([name]) => name)].join(',')];
  r.frequency.forEach((w, i) => {
    const cells = CSV_COLUMNS.map(([, series]) => {
      const v = series(r)?.[i];
      return v === null || v === undefined ? '' : String(v);
    });
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
