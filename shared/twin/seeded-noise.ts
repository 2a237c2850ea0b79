/**
 * Reproducible measurement noise: mulberry32 (Tommy Ettinger, 2017, public domain; a 32-bit
 * state advanced by a Weyl sequence and mixed by multiply–xorshift, from memory) for uniform
 * numbers, and the Box–Muller transform (Box & Muller, Ann. Math. Statist. 29, 1958) for
 * Gaussian ones. The same seed gives the same sequence on every JavaScript engine, because
 * only 32-bit integer operations and Math.log/sqrt/cos/sin of those are involved.
 */
export interface GaussianSource {
  /** Next standard normal deviate (mean 0, standard deviation 1). */
  next(): number;
}

/**
 * Uniform generator on [0, 1) with a 32-bit seed.
 * @example const u = mulberry32(1); u(); // 0.6270739405881613
 */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/**
 * Standard normal deviates from a seeded mulberry32 stream, two per pair of uniforms.
 * @example const g = gaussianSource(7); const x = 0.001 * g.next(); // rad of noise
 */
export function gaussianSource(seed: number): GaussianSource {
  const uniform = mulberry32(seed);
  let spare = 0;
  let hasSpare = false;
  return {
    next() {
      if (hasSpare) {
        hasSpare = false;
        return spare;
      }
      // 1 − u lies in (0, 1]: the logarithm never sees 0.
      const radius = Math.sqrt(-2 * Math.log(1 - uniform()));
      const angle = 2 * Math.PI * uniform();
      spare = radius * Math.sin(angle);
      hasSpare = true;
      return radius * Math.cos(angle);
    },
  };
}
