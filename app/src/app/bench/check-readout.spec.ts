import type { CheckResponse } from '@kinetwin/shared/protocol/check-api';
import { checkReadout, formatPercent, formatScale, linearRangeText, residualText, verdictReadout } from './check-readout';

const tried: [number, number] = [0.001, 1000];

describe('formatPercent', () => {
  it('gives three significant figures from 0.01 % and powers of ten below', () => {
    expect(formatPercent(1e-4)).toBe('0.01 %');
    expect(formatPercent(0.23461682820461466)).toBe('23.5 %');
    expect(formatPercent(1.88e-10)).toBe('1.9e-8 %');
    expect(formatPercent(0)).toBe('0 %');
  });
});

describe('formatScale', () => {
  it('writes a scale as a multiple of the input', () => {
    expect(formatScale(0.16962590880724207)).toBe('×0.17');
    expect(formatScale(1000)).toBe('×1000');
    expect(formatScale(0.001)).toBe('×0.001');
  });
});

describe('verdictReadout', () => {
  it('shows the worst deviation as a percentage of the peak against the threshold', () => {
    expect(verdictReadout({ pass: false, worst: 0.2346, threshold: 1e-4, worstTime: 0.202, reason: 'torque limit ±1 N·m reached at t = 0.100 s in the u1 run' })).toEqual({
      pass: false,
      verdict: 'fails',
      deviation: 'worst deviation 23.5 % of the peak angle; passes up to 0.01 %',
      reason: 'torque limit ±1 N·m reached at t = 0.100 s in the u1 run',
    });
  });

  it('says a run stopped when the deviation has no finite figure', () => {
    expect(verdictReadout({ pass: false, worst: null, threshold: 1e-4, worstTime: 8, reason: 'the u1 run stopped before its horizon' }).deviation).toBe(
      'worst deviation unbounded (a run stopped before its horizon); passes up to 0.01 %',
    );
  });
});

describe('linearRangeText', () => {
  it('says the closed form holds over the whole range tried', () => {
    expect(linearRangeText({ scale: 1000, smallestScale: null, passesAtMax: true, summary: '', triedScales: tried })).toBe(
      'The closed form holds up to at least ×1000 of this input (the largest scale tried), and down to ×0.001.',
    );
  });

  it('says where a saturation ends it and whether this input is past it', () => {
    expect(linearRangeText({ scale: 0.1696, smallestScale: null, passesAtMax: false, summary: '', triedScales: tried })).toBe(
      'The closed form holds up to ×0.17 of this input. This input (×1) is past it: expect the twin to depart from the closed form.',
    );
    expect(linearRangeText({ scale: 4.2, smallestScale: null, passesAtMax: false, summary: '', triedScales: tried })).toBe('The closed form holds up to ×4.2 of this input. This input (×1) is inside it.');
  });

  it('says where a bounded effect ends it from below', () => {
    expect(linearRangeText({ scale: 1000, smallestScale: 3.1, passesAtMax: true, summary: '', triedScales: tried })).toBe(
      'The closed form holds from ×3.1 up to at least ×1000 of this input (the largest scale tried); smaller inputs are dominated by a bounded effect such as friction or a dead band. This input (×1) is below that: expect the twin to depart from the closed form.',
    );
  });

  it('says when no scale tried holds', () => {
    expect(linearRangeText({ scale: null, smallestScale: null, passesAtMax: false, summary: '', triedScales: tried })).toBe(
      'The closed form does not hold at any scale tried, from ×0.001 to ×1000 of this input.',
    );
  });
});

describe('residualText', () => {
  it('gives RMS, max and when, and a twin that stopped early', () => {
    expect(residualText({ available: true, rms: 2.6477e-11, max: 9.5776e-11, timeOfMax: 1.603, relativeMax: 1.9e-10, twinStop: null })).toBe(
      'RMS 2.648e-11 rad, max 9.578e-11 rad at t = 1.603 s.',
    );
    expect(residualText({ available: true, rms: 0.1, max: 0.2, timeOfMax: 3, relativeMax: null, twinStop: 'angle left ±1000000 rad at t = 8 s' })).toBe(
      'RMS 0.1 rad, max 0.2 rad at t = 3 s. The twin stopped early: angle left ±1000000 rad at t = 8 s.',
    );
  });

  it('says why there is no comparison', () => {
    expect(residualText({ available: false, reason: 'the scenario has no closed form: "horizon": too long' })).toBe('No comparison: the scenario has no closed form: "horizon": too long.');
  });
});

describe('checkReadout', () => {
  it('reads a whole answer, with the time it took', () => {
    const answer: CheckResponse = {
      superposition: { pass: true, worst: 1.9e-10, threshold: 1e-4, worstTime: 0.4, reason: 'superposition holds' },
      shift: { pass: true, worst: 1.4e-10, threshold: 1e-4, worstTime: 0.9, reason: 'time invariance holds' },
      linearRange: { scale: 1000, smallestScale: null, passesAtMax: true, summary: 'superposition holds at every end of the range tried, 0.001 to 1000', triedScales: tried },
      twinVsClosedForm: { available: false, reason: 'x' },
      elapsedMs: 421.3,
    };
    const readout = checkReadout(answer);
    expect(readout.superposition.verdict).toBe('passes');
    expect(readout.shift.verdict).toBe('passes');
    expect(readout.linearRangeDetail).toBe(answer.linearRange.summary);
    expect(readout.residualAvailable).toBe(false);
    expect(readout.elapsed).toBe('Checked in 0.4213 s on the server.');
  });
});
