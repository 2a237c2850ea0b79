import { DEFAULT_FREQUENCY_GRID, type FrequencyGridRequest, logFrequencies } from '@kinetwin/shared/frequency/frequency-grid';
import type { FieldError, Parsed } from '@kinetwin/shared/validation/field-errors';
import { DECIMAL } from '@kinetwin/shared/scenario/field-edits';

/** The grid fields as typed on the frequency panel. */
export interface GridTexts {
  from: string;
  to: string;
  points: string;
}

export type GridField = keyof GridTexts;

/** The shared default grid as the form first shows it. */
export const DEFAULT_GRID_TEXTS: GridTexts = {
  from: String(DEFAULT_FREQUENCY_GRID.from),
  to: String(DEFAULT_FREQUENCY_GRID.to),
  points: String(DEFAULT_FREQUENCY_GRID.points),
};

/**
 * The typed grid as a request the frequency response accepts, or field errors naming `from`,
 * `to` or `points`: text that is not a plain decimal number gets its own message, the bounds and
 * ordering are logFrequencies' own (one rule in one place), so no refused grid reaches the
 * computation.
 * @example gridRequestOf({ from: '1', to: '0.5', points: '200' }) // { ok: false, errors: [{ field: 'to', message: 'must be above from' }] }
 */
export function gridRequestOf(texts: GridTexts): Parsed<FrequencyGridRequest> {
  const textErrors: FieldError[] = [];
  const read = (field: GridField): number => {
    const trimmed = texts[field].trim();
    if (trimmed === '') textErrors.push({ field, message: 'is required' });
    else if (!DECIMAL.test(trimmed)) textErrors.push({ field, message: `must be a number, got "${texts[field]}"` });
    else return Number(trimmed);
    return Number.NaN;
  };
  const request: FrequencyGridRequest = { from: read('from'), to: read('to'), points: read('points') };
  const checked = logFrequencies(request);
  if (textErrors.length === 0) return checked.ok ? { ok: true, value: request } : checked;
  // An unreadable field is NaN in the request: logFrequencies' words about it would only repeat ours.
  const unreadable = new Set(textErrors.map((error) => error.field));
  const rangeErrors = checked.ok ? [] : checked.errors.filter((error) => !unreadable.has(error.field));
  return { ok: false, errors: [...textErrors, ...rangeErrors] };
}
