import type { LocusGain, RootLocusRequest } from '@kinetwin/shared/frequency/root-locus';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import type { FieldError, Parsed } from '@kinetwin/shared/validation/field-errors';
import { DECIMAL } from '@kinetwin/shared/scenario/field-edits';
import { catalogueEntry } from '@kinetwin/shared/scenario/parameter-catalogue';
import { formatQuantity } from './scenario-facts';

/** The locus fields as typed; a blank end takes its default from the draft's own gain. */
export interface LocusTexts {
  gain: LocusGain;
  from: string;
  to: string;
  points: string;
  spacing: 'linear' | 'log';
}

export type LocusField = 'from' | 'to' | 'points';

export const DEFAULT_LOCUS_TEXTS: LocusTexts = { gain: 'kp', from: '', to: '', points: '200', spacing: 'linear' };

/** Units of each gain, from the shared catalogue as the tuning form gives them. */
export const GAIN_UNITS: Record<LocusGain, string> = {
  kp: catalogueEntry('controller.kp').unit,
  ki: catalogueEntry('controller.ki').unit,
  kd: catalogueEntry('controller.kd').unit,
};

/** How many times the current gain the range reaches by default. */
const DEFAULT_SPAN = 3;

/**
 * The default range of a gain: 0 to three times its value in the draft, or 0 to 1 when it is 0.
 * @example defaultLocusRange(wrist, 'kp') // { from: 0, to: 18 }
 */
export function defaultLocusRange(scenario: Scenario, gain: LocusGain): { from: number; to: number } {
  const current = scenario.controller[gain];
  return { from: 0, to: current > 0 ? DEFAULT_SPAN * current : 1 };
}

/** The default range in words, for the fields' hints. */
export function defaultRangeText(scenario: Scenario, gain: LocusGain): string {
  const { from, to } = defaultLocusRange(scenario, gain);
  const why = scenario.controller[gain] > 0 ? `${DEFAULT_SPAN}× the draft's ${gain}` : `the draft's ${gain} is 0`;
  return `${formatQuantity(from)} to ${formatQuantity(to)} (${why})`;
}

/**
 * The typed fields as a locus request, or field errors naming `from`, `to` or `points` for text
 * that is not a plain number. The range rules (to above from, from above 0 for log spacing, the
 * point count) are rootLocus' own, which reports them under the same field names.
 */
export function locusRequestOf(scenario: Scenario, texts: LocusTexts): Parsed<RootLocusRequest> {
  const errors: FieldError[] = [];
  const defaults = defaultLocusRange(scenario, texts.gain);
  const read = (field: LocusField, fallback: number | null): number => {
    const trimmed = texts[field].trim();
    if (trimmed === '' && fallback !== null) return fallback;
    if (trimmed === '') errors.push({ field, message: 'is required' });
    else if (!DECIMAL.test(trimmed) || !Number.isFinite(Number(trimmed))) errors.push({ field, message: `must be a number, got "${texts[field]}"` });
    else return Number(trimmed);
    return Number.NaN;
  };
  const request: RootLocusRequest = { gain: texts.gain, from: read('from', defaults.from), to: read('to', defaults.to), points: read('points', null), spacing: texts.spacing };
  return errors.length > 0 ? { ok: false, errors } : { ok: true, value: request };
}
