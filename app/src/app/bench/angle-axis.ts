import { formatQuantity } from './scenario-facts';

/**
 * Largest angle the chart's axis spans, rad (about 16 turns). An unstable run or closed form grows
 * without bound (2e+64 rad seen): autoscaling to it flattens every other trace to a line at 0, so
 * past this the axis is clipped and a note says so. Twin runs stop at their own runaway bound.
 */
export const ANGLE_AXIS_LIMIT = 100;

/** The angle axis for the traces drawn: autoscaled, or clipped to ±ANGLE_AXIS_LIMIT with a note. */
export type AngleAxis = { clipped: false } | { clipped: true; range: [number, number]; note: string };

/**
 * Whether the traces leave ±ANGLE_AXIS_LIMIT; then the axis spans what lies inside (at least the
 * limit on the side they leave by) and the note names the largest magnitude reached.
 * @example angleAxis([Float64Array.of(0, 2e64)]) // { clipped: true, range: [-100, 100]… }
 */
export function angleAxis(traces: readonly ArrayLike<number>[]): AngleAxis {
  let low = 0;
  let high = 0;
  let peak = 0;
  for (const trace of traces) {
    for (let i = 0; i < trace.length; i++) {
      const value = trace[i]!;
      if (!Number.isFinite(value)) continue;
      peak = Math.max(peak, Math.abs(value));
      if (Math.abs(value) <= ANGLE_AXIS_LIMIT) {
        low = Math.min(low, value);
        high = Math.max(high, value);
      } else if (value > 0) high = ANGLE_AXIS_LIMIT;
      else low = -ANGLE_AXIS_LIMIT;
    }
  }
  if (peak <= ANGLE_AXIS_LIMIT) return { clipped: false };
  return {
    clipped: true,
    range: [low, high],
    note: `The angle reaches ${formatQuantity(peak, 'rad')}: the axis is clipped to ±${ANGLE_AXIS_LIMIT} rad so the rest stays readable.`,
  };
}
