import { type Complex } from '../complex-number';

/** Default number of Talbot nodes: about 0.6·M significant digits before roundoff, which in double precision limits it near 1e-10. */
export const TALBOT_NODES = 32;

/**
 * Fixed-Talbot numerical inversion of a Laplace transform, written independently of the engine
 * for the tests (Abate & Whitt 2006, "A unified framework for numerically inverting Laplace
 * transforms", INFORMS J. Computing; the fixed Talbot contour of Abate & Valkó 2004):
 *   f(t) ≈ (r/M)·[½F(r)e^(rt) + Σ_{k=1}^{M−1} Re(e^(t·s_k) F(s_k)(1 + jσ_k))],
 *   r = 2M/(5t), θ_k = kπ/M, s_k = rθ_k(cot θ_k + j), σ_k = θ_k + (θ_k cot θ_k − 1)cot θ_k.
 * The contour must enclose every singularity: valid for t with |Im p|·t well inside 2M/5·π/2.
 * @example fixedTalbot((s) => div(one, s), 1) // ≈ 1
 */
export function fixedTalbot(F: (s: Complex) => Complex, t: number, M = TALBOT_NODES): number {
  const r = (2 * M) / (5 * t);
  const f0 = F({ re: r, im: 0 });
  let sum = 0.5 * f0.re * Math.exp(r * t);
  for (let k = 1; k < M; k++) {
    const theta = (k * Math.PI) / M;
    const cot = 1 / Math.tan(theta);
    const sr = r * theta * cot;
    const si = r * theta;
    const sigma = theta + (theta * cot - 1) * cot;
    const Fs = F({ re: sr, im: si });
    const m = Math.exp(t * sr);
    const er = m * Math.cos(t * si);
    const ei = m * Math.sin(t * si);
    // e^(ts)·F(s)·(1 + jσ), real part
    const pr = er * Fs.re - ei * Fs.im;
    const pi = er * Fs.im + ei * Fs.re;
    sum += pr - pi * sigma;
  }
  return (r / M) * sum;
}
