import { linearizeAbout } from '@kinetwin/shared/linearize/operating-point';
import type { OperatingRangeResponse } from '@kinetwin/shared/protocol/check-api';
import { parseScenario } from '@kinetwin/shared/scenario/parse-scenario';
import { UNSTABLE_LINEAR_CAUTION, linearModelReadout, operatingRangeText } from './linearize-readout';

// Demo data (invented numbers): a 1.2 kg link, centre of mass 0.25 m out, hanging straight down at θ = 0.
const parsed = parseScenario({
  kind: 'kinetwin/scenario',
  version: 1,
  name: 'Demo pendulum arm',
  joint: { inertia: 0.09, damping: 0.2, stiffness: 0.5 },
  controller: { mode: 'pid', kp: 20, ki: 2, kd: 1.5, derivativeOn: 'measurement' },
  inputs: [{ channel: 'reference', shape: 'step', amplitude: 0.1, delay: 0.1 }],
  horizon: 3,
  nonlinear: { gravity: { mass: 1.2, arm: 0.25 }, coulombFriction: 0.05 },
});
if (!parsed.ok) throw new Error('fixture invalid');
const arm = parsed.value;
const mgl = 1.2 * 9.80665 * 0.25;

function about(angle: number, holding: 'feed-forward' | 'disturbance' = 'feed-forward') {
  const r = linearizeAbout(arm, { angle, holding });
  if (!r.ok) throw new Error('refused');
  return r.value;
}

describe('linearModelReadout', () => {
  it('gives k + m·g·l·cos θ0 and the holding torque, with the shared notes', () => {
    const model = about(Math.PI / 3);
    const r = linearModelReadout(model, true);
    // Pendulum linearized about θ0: stiffness m·g·l·cos θ0 added to the spring's (common practice).
    expect(r.stiffness).toBe(`${Number((0.5 + mgl * 0.5).toPrecision(4))} N·m/rad`);
    expect(r.holdingTorque).toBe(`${Number((0.5 * (Math.PI / 3) + mgl * Math.sin(Math.PI / 3)).toPrecision(4))} N·m`);
    expect(r.holdingDetail).toContain('feed-forward');
    expect(r.notes).toBe(model.notes);
    expect(r.notes.some((note) => note.startsWith('friction is left out'))).toBe(true);
    expect(r.caution).toBeNull();
    expect(linearModelReadout(about(Math.PI / 3, 'disturbance'), false).holdingDetail).toContain('left to the loop');
  });

  it('cautions when the joint above its balance point is unstable without its loop', () => {
    const r = linearModelReadout(about(Math.PI), true);
    expect(r.caution).toBe(UNSTABLE_LINEAR_CAUTION);
  });
});

describe('operatingRangeText', () => {
  const answer = (range: OperatingRangeResponse['range']): OperatingRangeResponse => ({ linear: {}, effectiveStiffness: 1.97, holdingTorque: 3.1, notes: [], range, elapsedMs: 400 });

  it('gives the largest move in rad and degrees, the scale and the summary', () => {
    const text = operatingRangeText(answer({ tolerance: 0.01, scale: 2.5, smallestScale: null, largestMove: 0.2618, checks: 14, summary: 'agree up to scale 2.5' }));
    expect(text).toEqual({ headline: "The linear model holds within 1 % of the peak for moves up to 0.2618 rad (15°) from θ0: ×2.5 of the scenario's moves.", summary: 'agree up to scale 2.5' });
  });

  it('says when no scale agrees, and when there is no move to grow', () => {
    expect(operatingRangeText(answer({ tolerance: 0.05, scale: null, smallestScale: null, largestMove: null, checks: 12, summary: 'none agree' })).headline).toBe(
      'The linear model and the twin do not agree within 5 % of the peak at any scale of the moves tried.',
    );
    expect(operatingRangeText(answer(null))).toEqual({ headline: expect.stringContaining('no inputs to grow'), summary: null });
  });
});
