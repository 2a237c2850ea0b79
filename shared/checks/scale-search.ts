/** A verdict at one input scale: whether it passes, and why not. */
export interface ScaleVerdict {
  pass: boolean;
  reason: string;
}

export interface ScaleSearchOptions {
  minScale: number;
  maxScale: number;
  /** The search stops when the bracket's ends are within this factor of each other. */
  relativeWidth: number;
  maxIterations: number;
}

/** Where a verdict holds along the input scale, assuming one crossing between the ends. */
export type ScaleSearch<V extends ScaleVerdict> =
  /** Both ends pass. */
  | { kind: 'everywhere'; checks: number }
  /** Both ends fail: `failure` is the verdict at the small end. */
  | { kind: 'nowhere'; checks: number; failure: V }
  /** Passes up to `good`, fails at `bad` > good (a limit that large inputs reach). */
  | { kind: 'up-to'; good: number; bad: number; checks: number; failure: V }
  /** Fails at `bad` and passes from `good` > bad up (a bounded effect that dominates small inputs). */
  | { kind: 'from'; good: number; bad: number; checks: number; failure: V };

/**
 * Bisection on log s between minScale and maxScale for the scale where `checkAt` changes its
 * verdict, keeping the last passing scale and the first failing one. The linear range and the
 * operating-point range share it.
 */
export function searchScale<V extends ScaleVerdict>(checkAt: (scale: number) => V, o: ScaleSearchOptions): ScaleSearch<V> {
  if (!(o.minScale > 0 && o.maxScale > o.minScale && o.relativeWidth > 0)) {
    throw new RangeError(`need 0 < minScale < maxScale and relativeWidth > 0, got ${o.minScale}, ${o.maxScale}, ${o.relativeWidth}`);
  }
  let checks = 0;
  const at = (s: number) => {
    checks++;
    return checkAt(s);
  };
  const top = at(o.maxScale);
  const bottom = at(o.minScale);
  if (top.pass && bottom.pass) return { kind: 'everywhere', checks };
  if (!top.pass && !bottom.pass) return { kind: 'nowhere', checks, failure: bottom };
  let good = top.pass ? o.maxScale : o.minScale;
  let bad = top.pass ? o.minScale : o.maxScale;
  let failure = top.pass ? bottom : top;
  for (let i = 0; i < o.maxIterations && Math.max(good, bad) / Math.min(good, bad) > 1 + o.relativeWidth; i++) {
    const mid = Math.sqrt(good * bad);
    const verdict = at(mid);
    if (verdict.pass) good = mid;
    else {
      bad = mid;
      failure = verdict;
    }
  }
  return { kind: top.pass ? 'from' : 'up-to', good, bad, checks, failure };
}
