import { DEFAULT_LINEARIZE_TEXTS, linearizeRequestOf } from './linearize-input';

describe('linearizeRequestOf', () => {
  it('reads θ0 in degrees or radians and the tolerance in percent', () => {
    const deg = linearizeRequestOf({ ...DEFAULT_LINEARIZE_TEXTS, angle: '60', tolerancePercent: '2.5' });
    expect(deg).toEqual({ ok: true, value: { angle: Math.PI / 3, holding: 'feed-forward', tolerance: 0.025 } });
    const rad = linearizeRequestOf({ angle: ' -1.2 ', unit: 'rad', holding: 'disturbance', tolerancePercent: '1' });
    expect(rad).toEqual({ ok: true, value: { angle: -1.2, holding: 'disturbance', tolerance: 0.01 } });
  });

  it('starts at 0° with the feed-forward and the route default of 1 %', () => {
    expect(linearizeRequestOf(DEFAULT_LINEARIZE_TEXTS)).toEqual({ ok: true, value: { angle: 0, holding: 'feed-forward', tolerance: 0.01 } });
  });

  it('names each field it refuses', () => {
    const errorsOf = (angle: string, tolerancePercent: string) => {
      const r = linearizeRequestOf({ ...DEFAULT_LINEARIZE_TEXTS, angle, tolerancePercent });
      return r.ok ? [] : r.errors;
    };
    expect(errorsOf('', '1')).toEqual([{ field: 'angle', message: 'is required' }]);
    expect(errorsOf('sixty', '1')).toEqual([{ field: 'angle', message: 'must be a number, got "sixty"' }]);
    expect(errorsOf('60', '0')).toEqual([{ field: 'tolerance', message: 'must be above 0 % and below 100 %' }]);
    expect(errorsOf('60', '100')).toEqual([{ field: 'tolerance', message: 'must be above 0 % and below 100 %' }]);
    expect(errorsOf('1e999', 'x')).toEqual([
      { field: 'angle', message: 'must be a number, got "1e999"' },
      { field: 'tolerance', message: 'must be a number, got "x"' },
    ]);
  });
});
