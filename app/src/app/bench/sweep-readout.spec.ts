import { frequencyResponseOf } from '@kinetwin/shared/frequency/frequency-response';
import type { SineSweepResponse } from '@kinetwin/shared/protocol/check-api';
import { parseScenario } from '@kinetwin/shared/scenario/parse-scenario';
import { sweepReadout } from './sweep-readout';

// Demo data (invented numbers): the wrist demo's loop, on a three-point grid.
const parsed = parseScenario({
  kind: 'kinetwin/scenario',
  version: 1,
  name: 'Wrist pitch',
  joint: { inertia: 0.012, damping: 0.04, stiffness: 0 },
  controller: { mode: 'pid', kp: 6, ki: 1, kd: 0.4, derivativeOn: 'measurement' },
  inputs: [{ channel: 'reference', shape: 'step', amplitude: 0.5, delay: 0.1 }],
  horizon: 2,
});
if (!parsed.ok) throw new Error('fixture invalid');
const cf = frequencyResponseOf(parsed.value, { from: 1, to: 100, points: 3 });
if (!cf.ok) throw new Error('grid refused');
const closedForm = cf.value;
const ref = closedForm.referenceToAngle!;

// Shaped like the server's answer: the first point the closed form plus a small gap, the second
// bent by a torque limit and held by friction, the third without a figure.
const answer: SineSweepResponse = {
  channel: 'reference',
  amplitude: 0.5,
  elapsedMs: 1234,
  points: [
    { frequency: 1, magnitudeDb: ref.magnitudeDb[0]! + 0.002, phaseDeg: ref.phaseDeg[0]! - 0.5, distortion: 1e-7, saturated: false, stuck: false, reason: null },
    { frequency: 10, magnitudeDb: -3.5, phaseDeg: -120, distortion: 0.12, saturated: true, stuck: true, reason: null },
    { frequency: 100, magnitudeDb: null, phaseDeg: null, distortion: null, saturated: false, stuck: false, reason: 'the twin stopped: work budget spent' },
  ],
};

describe('sweepReadout', () => {
  it('reads each measured point against the closed form of its path at the same frequency', () => {
    const r = sweepReadout(answer, closedForm);
    expect(r.summary).toBe('reference → angle, a sine of 0.5 rad on the reference: 2 of 3 frequencies measured in 1.234 s on the server.');
    expect(r.rows).toHaveLength(2);
    expect(r.rows[0]).toMatchObject({ frequency: '1 rad/s', magnitudeGap: '+0.002 dB', phaseGap: '-0.5°', distortion: '1.0e-5 %', flags: [] });
    expect(r.rows[0]!.closedFormMagnitude).toBe(`${Number(ref.magnitudeDb[0]!.toPrecision(4))} dB`);
    expect(r.rows[1]).toMatchObject({ frequency: '10 rad/s', magnitude: '-3.5 dB', phase: '-120°', distortion: '12 %', flags: ['torque limit', 'stuck'] });
    expect(r.unmeasured).toEqual([{ key: '2', frequency: '100 rad/s', reason: 'the twin stopped: work budget spent' }]);
  });

  it('hands the chart every point on its path, nulls where there is no figure, and says when it is stale', () => {
    const { overlay } = sweepReadout(answer, closedForm, true);
    expect(overlay).toEqual({
      path: 'referenceToAngle',
      frequency: [1, 10, 100],
      magnitudeDb: [answer.points[0]!.magnitudeDb, -3.5, null],
      phaseDeg: [answer.points[0]!.phaseDeg, -120, null],
      distortion: [1e-7, 0.12, null],
      stale: true,
    });
    expect(sweepReadout({ ...answer, channel: 'torque', amplitude: 2 }, closedForm).overlay.path).toBe('torqueToAngle');
  });

  it('shows no closed-form figure while the closed form is not there', () => {
    const r = sweepReadout(answer, null);
    expect(r.rows[0]).toMatchObject({ closedFormMagnitude: '—', magnitudeGap: '—', closedFormPhase: '—', phaseGap: '—' });
  });
});
