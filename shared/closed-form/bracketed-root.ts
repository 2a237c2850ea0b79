/** Iteration cap for bracketed root refinement; Illinois converges superlinearly, so 200 is never reached in practice. */
export const BRACKETED_ROOT_MAX_ITERATIONS = 200;

/**
 * A root of f in [a, b] where f(a), f(b) differ in sign, by the Illinois variant of regula falsi
 * with a bisection step whenever the bracket stops shrinking. Stops at a bracket width of
 * ~4ε·|b| or after BRACKETED_ROOT_MAX_ITERATIONS steps (then returns the best estimate).
 * @example findBracketedRoot((x) => x * x - 2, 1, 2) // ≈ 1.4142135623730951
 */
export function findBracketedRoot(f: (x: number) => number, a0: number, b0: number, fa0 = f(a0), fb0 = f(b0)): number {
  let a = a0;
  let b = b0;
  let fa = fa0;
  let fb = fb0;
  if (fa === 0) return a;
  if (fb === 0) return b;
  if (fa * fb > 0) return Math.abs(fa) < Math.abs(fb) ? a : b; // not a bracket: the closer end is the best we know
  let side = 0;
  for (let it = 0; it < BRACKETED_ROOT_MAX_ITERATIONS; it++) {
    const width = Math.abs(b - a);
    if (width <= 4 * Number.EPSILON * Math.max(Math.abs(a), Math.abs(b), Number.MIN_VALUE)) break;
    let x = (a * fb - b * fa) / (fb - fa);
    // Regula falsi can stall at one end; fall back to bisection when the point leaves the interior.
    if (!(x > Math.min(a, b) && x < Math.max(a, b))) x = 0.5 * (a + b);
    const fx = f(x);
    if (fx === 0) return x;
    if (fx * fb < 0) {
      a = b;
      fa = fb;
      b = x;
      fb = fx;
      side = 0;
    } else {
      b = x;
      fb = fx;
      fa *= 0.5; // Illinois: halve the stale end's value so the next secant moves it
      if (++side > 2) {
        // Three one-sided steps: bisect to restore a guaranteed shrink.
        const m = 0.5 * (a + b);
        const fm = f(m);
        if (fm * fb < 0) {
          a = b;
          fa = fb;
        }
        b = m;
        fb = fm;
        side = 0;
      }
    }
  }
  return Math.abs(fa) < Math.abs(fb) ? a : b;
}
