import { type FieldError, type Parsed } from '../validation/field-errors';
import { DEFAULT_SETTLING_BAND, SETTLING_BANDS, type SettlingBand } from './step-metrics';

/** Options of solveClosedForm. */
export interface ClosedFormOptions {
  /** Settling band as a fraction of the final value: 0.02 (2 %) or 0.05 (5 %). */
  settlingBand?: SettlingBand;
}

/** The defaults, documented once: a 2 % settling band. */
export const DEFAULT_CLOSED_FORM_OPTIONS: Required<ClosedFormOptions> = { settlingBand: DEFAULT_SETTLING_BAND };

/** Checks caller-supplied options; errors name "options.<key>". */
export function resolveClosedFormOptions(options: ClosedFormOptions | undefined): Parsed<Required<ClosedFormOptions>> {
  const merged = { ...DEFAULT_CLOSED_FORM_OPTIONS, ...(options ?? {}) };
  const errors: FieldError[] = [];
  if (!(SETTLING_BANDS as readonly number[]).includes(merged.settlingBand)) {
    errors.push({ field: 'options.settlingBand', message: `settlingBand must be ${SETTLING_BANDS.join(' or ')}, got ${String(merged.settlingBand)}` });
  }
  return errors.length > 0 ? { ok: false, errors } : { ok: true, value: merged };
}
