import { poleText } from './closed-form-readout';

describe('pole text', () => {
  it('shows a real part that is roundoff as 0', () => {
    expect(poleText({ re: -2.220446049250313e-16, im: 3, multiplicity: 1 })).toBe('0 ± 3j rad/s');
  });
});
