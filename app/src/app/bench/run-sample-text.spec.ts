import { sampleReadings } from './run-sample-text';

describe('sample readings', () => {
  it('words a sample with units and yes/no flags', () => {
    const readings = sampleReadings({ t: 0.5, angle: 0.25, velocity: -0.1, controllerTorque: 2, appliedTorque: 1.5, saturating: true, sticking: false });
    expect(readings.map((r) => `${r.label} ${r.value}`)).toEqual(['t 0.5 s', 'angle 0.25 rad', 'velocity -0.1 rad/s', 'applied torque 1.5 N·m', 'saturating yes', 'sticking no']);
  });

  it('shows a dash, never NaN, for a value the twin did not send', () => {
    const readings = sampleReadings({ t: 1, angle: 0, velocity: Number.NaN, controllerTorque: 0, appliedTorque: Number.POSITIVE_INFINITY, saturating: false, sticking: true });
    expect(readings.find((r) => r.key === 'velocity')?.value).toBe('—');
    expect(readings.find((r) => r.key === 'appliedTorque')?.value).toBe('—');
    expect(readings.map((r) => r.value).join(' ')).not.toContain('NaN');
  });

  it('reads roundoff dust as 0', () => {
    const readings = sampleReadings({ t: 1, angle: -2.220446049250313e-16, velocity: 4e-17, controllerTorque: 0, appliedTorque: 0, saturating: false, sticking: false });
    expect([readings[1]!.value, readings[2]!.value]).toEqual(['0 rad', '0 rad/s']);
  });
});
