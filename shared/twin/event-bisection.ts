/** Most halvings when locating an event; 2^−80 of any step is far below double resolution. */
export const MAX_EVENT_BISECTIONS = 80;

/**
 * Locates where g turns positive inside one integrator step, given g(lo) ≤ 0 < g(hi), by
 * bisection on the step's dense output. Returns the right end of the final bracket, so the
 * returned time is just past the event (g > 0 there) and a restart sees the new regime.
 * @param g event function of time (its state comes from the dense output)
 * @param lo s, with g(lo) ≤ 0
 * @param hi s, with g(hi) > 0
 * @example firstPositive((t) => t - 0.3, 0, 1) // ≈ 0.3, within 1e-15
 */
export function firstPositive(g: (t: number) => number, lo: number, hi: number): number {
  let a = lo;
  let b = hi;
  for (let i = 0; i < MAX_EVENT_BISECTIONS; i++) {
    const mid = 0.5 * (a + b);
    // Stop once the bracket cannot be split in double precision.
    if (mid <= a || mid >= b) break;
    if (g(mid) > 0) b = mid;
    else a = mid;
  }
  return b;
}
