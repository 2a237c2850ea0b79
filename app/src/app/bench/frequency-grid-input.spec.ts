import { DEFAULT_FREQUENCY_GRID, MAX_FREQUENCY_POINTS } from '@kinetwin/shared/frequency/frequency-grid';
import { DEFAULT_GRID_TEXTS, gridRequestOf } from './frequency-grid-input';

describe('gridRequestOf', () => {
  it('reads the default texts back as the shared default grid', () => {
    expect(gridRequestOf(DEFAULT_GRID_TEXTS)).toEqual({ ok: true, value: { ...DEFAULT_FREQUENCY_GRID } });
  });

  it('takes plain decimals with exponents and spaces around them', () => {
    expect(gridRequestOf({ from: ' 1e-2', to: '2.5E3 ', points: '50' })).toEqual({ ok: true, value: { from: 0.01, to: 2500, points: 50 } });
  });

  it("refuses an upside-down grid with logFrequencies' own words", () => {
    expect(gridRequestOf({ from: '10', to: '1', points: '200' })).toEqual({ ok: false, errors: [{ field: 'to', message: 'must be above from' }] });
  });

  it('names each field out of bounds', () => {
    const result = gridRequestOf({ from: '0', to: '1e10', points: String(MAX_FREQUENCY_POINTS + 1) });
    expect(result.ok).toBe(false);
    if (result.ok) return;
    expect(result.errors.map((error) => error.field)).toEqual(['from', 'to', 'points']);
    expect(result.errors[0]!.message).toBe('must be a frequency from 0.000001 to 1000000000 rad/s');
    expect(result.errors[2]!.message).toBe('must be a whole number from 2 to 10000');
  });

  it('refuses a fractional point count', () => {
    expect(gridRequestOf({ from: '1', to: '10', points: '2.5' })).toEqual({ ok: false, errors: [{ field: 'points', message: 'must be a whole number from 2 to 10000' }] });
  });

  it('says text is not a number without repeating the range rule about it', () => {
    // Number() alone would take "0x10" as 16 and "Infinity" as a number.
    const result = gridRequestOf({ from: '0x10', to: 'Infinity', points: '' });
    expect(result).toEqual({
      ok: false,
      errors: [
        { field: 'from', message: 'must be a number, got "0x10"' },
        { field: 'to', message: 'must be a number, got "Infinity"' },
        { field: 'points', message: 'is required' },
      ],
    });
  });

  it('keeps the range rule for the fields that are readable', () => {
    expect(gridRequestOf({ from: 'abc', to: '1e12', points: '200' })).toEqual({
      ok: false,
      errors: [
        { field: 'from', message: 'must be a number, got "abc"' },
        { field: 'to', message: 'must be a frequency from 0.000001 to 1000000000 rad/s' },
      ],
    });
  });
});
