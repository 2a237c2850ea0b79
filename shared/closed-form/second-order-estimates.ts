import { absComplex } from './complex-number';
import { type PoleCluster } from './pole-clusters';
import { type SettlingBand } from './step-metrics';

/**
 * How much further left every other pole must lie for a pair to count as dominant
 * (common practice: five times the pair's real part).
 */
export const DOMINANCE_RATIO = 5;

/** The slowest complex pair of the loop and what the textbook second-order formulas predict from it. */
export interface DominantPair {
  /** Damping ratio ζ. */
  zeta: number;
  /** Natural frequency ωn, rad/s. */
  naturalFrequency: number;
  /** Damped frequency ωd = ωn√(1 − ζ²), rad/s. */
  dampedFrequency: number;
  /** True when every other loop pole lies DOMINANCE_RATIO times further left (the estimates then mean something). */
  dominant: boolean;
  estimates: {
    /** 100·exp(−ζπ/√(1 − ζ²)), %. */
    overshootPercent: number;
    /** π/ωd, s. */
    peakTime: number;
    /** 4/(ζωn) for 2 %, 3/(ζωn) for 5 %, s. */
    settlingTime: number;
    /** 1.8/ωn, s (10–90 %, a fit good near ζ = 0.5). */
    riseTime: number;
  };
}

/**
 * ζ, ωn, ωd of the slowest stable complex pair, with the standard second-order estimates
 * (Ogata, Modern Control Engineering, ch. 5, from memory; the rise-time fit 1.8/ωn from
 * Franklin, Powell & Emami-Naeini, Feedback Control of Dynamic Systems, from memory).
 * Null when the loop has no stable complex pair.
 * @example dominantPair([{ center: { re: -1, im: Math.sqrt(3) }, multiplicity: 1 }, ...])?.zeta // 0.5
 */
export function dominantPair(loopPoles: readonly PoleCluster[], band: SettlingBand): DominantPair | null {
  const pairs = loopPoles.filter((c) => c.center.im > 0 && c.center.re < 0);
  if (pairs.length === 0) return null;
  const pair = pairs.reduce((a, b) => (b.center.re > a.center.re ? b : a));
  const wn = absComplex(pair.center);
  const zeta = -pair.center.re / wn;
  const wd = pair.center.im;
  const sigma = -pair.center.re;
  const others = loopPoles.filter((c) => c !== pair && !(c.center.re === pair.center.re && c.center.im === -pair.center.im));
  const dominant = pair.multiplicity === 1 && others.every((c) => -c.center.re >= DOMINANCE_RATIO * sigma);
  return {
    zeta,
    naturalFrequency: wn,
    dampedFrequency: wd,
    dominant,
    estimates: {
      overshootPercent: 100 * Math.exp((-zeta * Math.PI) / Math.sqrt(1 - zeta * zeta)),
      peakTime: Math.PI / wd,
      settlingTime: (band === 0.02 ? 4 : 3) / (zeta * wn),
      riseTime: 1.8 / wn,
    },
  };
}
