import katex from 'katex';
import { describe, expect, it } from 'vitest';
import { formatNumber } from './response-latex';
import { solved } from './testing/make-scenario';

describe('responseLatex', () => {
  const s = solved({
    joint: { inertia: 0.2, damping: 0.05, stiffness: 0 },
    controller: { mode: 'pid', kp: 8, ki: 4, kd: 1 },
    inputs: [
      { channel: 'reference', shape: 'step', amplitude: 1 },
      { channel: 'torque', shape: 'ramp', amplitude: 0.2, delay: 0.5 },
    ],
  });

  it('renders in KaTeX without errors and shows the delayed piece', () => {
    expect(() => katex.renderToString(s.latex.angle, { throwOnError: true })).not.toThrow();
    expect(() => katex.renderToString(s.latex.velocity, { throwOnError: true })).not.toThrow();
    expect(s.latex.angle.startsWith('\\theta(t) = ')).toBe(true);
    expect(s.latex.angle).toContain('u(t - 0.5)');
    expect(s.latex.angle).toContain('\\cos');
  });

  it('writes a resting joint as zero and formats powers of ten', () => {
    expect(solved({}).latex.angle).toBe('\\theta(t) = 0');
    expect(formatNumber(1.5e-7)).toBe('1.5\\cdot 10^{-7}');
    expect(formatNumber(-0.333333)).toBe('-0.3333');
  });
});
