import { describe, expect, it } from 'vitest';
import {
  addPolynomials,
  derivativeOfPolynomial,
  dividePolynomials,
  evaluatePolynomial,
  evaluatePolynomialComplex,
  multiplyPolynomials,
  polynomialDegree,
  polynomialFromRoots,
  zeroRootCount,
} from './polynomial';
import { addRational, cancelZeroRoots, limitAtInfinity, multiplyRational, valueAtZero } from './rational-function';

describe('polynomial algebra in s', () => {
  it('adds, multiplies and trims', () => {
    expect(addPolynomials([1, 2, 3], [0, 0, -3])).toEqual([1, 2]);
    expect(multiplyPolynomials([1, 1], [1, 1])).toEqual([1, 2, 1]);
    expect(polynomialDegree([0])).toBe(-1);
    expect(polynomialDegree([5, 0, 0])).toBe(0);
  });

  it('divides with a remainder of lower degree', () => {
    // (s³ + 2s² + 3s + 4) / (s + 1) = s² + s + 2 remainder 2
    const { quotient, remainder } = dividePolynomials([4, 3, 2, 1], [1, 1]);
    expect(quotient).toEqual([2, 1, 1]);
    expect(remainder).toEqual([2]);
    expect(() => dividePolynomials([1], [0])).toThrow(RangeError);
  });

  it('evaluates at real and complex points and differentiates', () => {
    expect(evaluatePolynomial([1, 0, 1], 3)).toBe(10);
    expect(evaluatePolynomialComplex([1, 0, 1], { re: 0, im: 1 })).toEqual({ re: 0, im: 0 });
    expect(derivativeOfPolynomial([7, 3, 0, 2])).toEqual([3, 0, 6]);
  });

  it('builds a real polynomial from a conjugate-closed root list', () => {
    expect(polynomialFromRoots([{ re: -1, im: 2 }, { re: -1, im: -2 }], 3)).toEqual([15, 6, 3]);
    expect(zeroRootCount([0, 0, 1])).toBe(2);
  });

  it('does rational algebra with exact cancellation of s', () => {
    const f = multiplyRational({ num: [0, 1], den: [1, 1] }, { num: [1], den: [0, 1] });
    expect(f).toEqual({ num: [1], den: [1, 1] });
    expect(addRational({ num: [1], den: [0, 1] }, { num: [-1], den: [1, 1] })).toEqual({ num: [1], den: [0, 1, 1] });
    expect(cancelZeroRoots({ num: [0, 0, 2], den: [0, 1, 1] })).toEqual({ num: [0, 2], den: [1, 1] });
    expect(limitAtInfinity({ num: [1, 2, 3], den: [1, 1] })).toEqual({ finite: false });
    expect(limitAtInfinity({ num: [1, 2], den: [1, 4] })).toEqual({ finite: true, value: 0.5 });
    expect(valueAtZero({ num: [0, 3], den: [0, 1, 1] })).toBe(3);
    expect(valueAtZero({ num: [1], den: [0, 1] })).toBeNull();
  });
});
