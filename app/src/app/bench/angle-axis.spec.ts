import { ANGLE_AXIS_LIMIT, angleAxis } from './angle-axis';

describe('angleAxis', () => {
  it('leaves the axis to autoscale while every angle is within the limit', () => {
    expect(angleAxis([Float64Array.of(0, 0.4, -0.2), Float64Array.of(Number.NaN, ANGLE_AXIS_LIMIT)])).toEqual({ clipped: false });
  });

  it('clips an unstable trace to the limit on the side it leaves by and says how far it went', () => {
    const axis = angleAxis([Float64Array.of(0, 0.5, -0.3), Float64Array.of(0, 3, 2e64)]);
    expect(axis.clipped && axis.range).toEqual([-0.3, ANGLE_AXIS_LIMIT]);
    expect(axis.clipped && axis.note).toContain('2e+64 rad');
    const both = angleAxis([Float64Array.of(-5e9, 7e9)]);
    expect(both.clipped && both.range).toEqual([-ANGLE_AXIS_LIMIT, ANGLE_AXIS_LIMIT]);
  });
});
