import { describe, expect, it } from 'vitest';
import { holdRequest, initialSampleHold } from './sampled-pid';

describe('the sampled controller’s hold', () => {
  it('passes each request on at once without a compute delay', () => {
    const hold = initialSampleHold();
    holdRequest(hold, 1.5, false);
    expect(hold.held).toBe(1.5);
    holdRequest(hold, -0.5, false);
    expect(hold.held).toBe(-0.5);
  });

  it('acts on each request one sample late with a compute delay, starting from no torque', () => {
    const hold = initialSampleHold();
    const held = [1.5, -0.5, 2].map((request) => {
      holdRequest(hold, request, true);
      return hold.held;
    });
    expect(held).toEqual([0, 1.5, -0.5]);
  });
});
