import type { HoldingMode } from '@kinetwin/shared/linearize/operating-point';
import type { FieldError, Parsed } from '@kinetwin/shared/validation/field-errors';
import { DECIMAL } from '@kinetwin/shared/scenario/field-edits';

/** The unit θ0 is typed in. */
export type AngleUnit = 'deg' | 'rad';

/** The linearize fields as typed. */
export interface LinearizeTexts {
  angle: string;
  unit: AngleUnit;
  holding: HoldingMode;
  /** Agreement the operating range asks for, in percent of the peak. */
  tolerancePercent: string;
}

export type LinearizeField = 'angle' | 'tolerance';

/** What the linearization and the operating range are asked for. */
export interface LinearizeRequest {
  /** θ0, rad. */
  angle: number;
  holding: HoldingMode;
  /** Fraction of the peak, e.g. 0.01. */
  tolerance: number;
}

/** The route's default tolerance (0.01, shared/protocol/check-api.ts) as the form first shows it. */
export const DEFAULT_LINEARIZE_TEXTS: LinearizeTexts = { angle: '0', unit: 'deg', holding: 'feed-forward', tolerancePercent: '1' };

/**
 * The typed fields as a request, or field errors naming `angle` or `tolerance`: θ0 a plain decimal
 * in the chosen unit (its range is the scenario's angle bound, which linearizeAbout checks), the
 * tolerance a percentage above 0 and below 100, as the operating-range route requires.
 * @example linearizeRequestOf({ angle: '60', unit: 'deg', holding: 'feed-forward', tolerancePercent: '1' }).value.angle // π/3
 */
export function linearizeRequestOf(texts: LinearizeTexts): Parsed<LinearizeRequest> {
  const errors: FieldError[] = [];
  const read = (field: LinearizeField, text: string): number => {
    const trimmed = text.trim();
    if (trimmed === '') errors.push({ field, message: 'is required' });
    else if (!DECIMAL.test(trimmed) || !Number.isFinite(Number(trimmed))) errors.push({ field, message: `must be a number, got "${text}"` });
    else return Number(trimmed);
    return Number.NaN;
  };
  const angle = read('angle', texts.angle);
  const percent = read('tolerance', texts.tolerancePercent);
  if (Number.isFinite(percent) && !(percent > 0 && percent < 100)) errors.push({ field: 'tolerance', message: 'must be above 0 % and below 100 %' });
  if (errors.length > 0) return { ok: false, errors };
  return { ok: true, value: { angle: texts.unit === 'deg' ? (angle * Math.PI) / 180 : angle, holding: texts.holding, tolerance: percent / 100 } };
}
