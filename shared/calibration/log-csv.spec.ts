import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { createLogBuilder } from './log-builder';
import { logCsvChunks } from './log-csv';
import { thinnedSeries } from './log-preview';

describe('logCsvChunks', () => {
  it('writes a header with SI units and one row per sample, in blocks', () => {
    const table = { time: Float64Array.from([0, 0.5, 1]), torque: Float64Array.from([1, 2, 3]), angle: Float64Array.from([0.1, 0.2, 0.3]) };
    const chunks = [...logCsvChunks(table, 2)];
    expect(chunks).toEqual(['time [s],angle [rad],torque [N·m]\n', '0,0.1,1\n0.5,0.2,2\n', '1,0.3,3\n']);
  });

  it('reads back through the builder to the very same doubles', () => {
    fc.assert(
      fc.property(fc.array(fc.tuple(fc.double({ min: 1e-6, max: 1, noNaN: true }), fc.double({ noNaN: true, noDefaultInfinity: true })), { minLength: 2, maxLength: 50 }), (pairs) => {
        let t = 0;
        const time = Float64Array.from(pairs.map(([dt]) => (t += dt)));
        const velocity = Float64Array.from(pairs.map(([, v]) => (v === 0 ? 0 : v)));
        const text = [...logCsvChunks({ time, velocity })].join('');
        const builder = createLogBuilder({ gaps: 'allow' });
        text
          .split('\n')
          .filter((l) => l !== '')
          .forEach((line, i) => builder.push(line.split(','), i + 1));
        const back = builder.finish();
        if (!back.ok) throw new Error(JSON.stringify(back.error));
        expect(Array.from(back.table.time)).toEqual(Array.from(time));
        expect(Array.from(back.table.velocity!)).toEqual(Array.from(velocity));
      }),
      { numRuns: 100 },
    );
  });
});

describe('thinnedSeries', () => {
  it('keeps the first and last samples and at most the asked number of points', () => {
    const n = 10_001;
    const time = Float64Array.from({ length: n }, (_, i) => i);
    const s = thinnedSeries({ time, angle: time }, 1000);
    expect(s.time.length).toBe(1000);
    expect(s.time[0]).toBe(0);
    expect(s.time[999]).toBe(n - 1);
    expect(s.values.angle).toEqual(s.time);
    expect(s.values.torque).toBeUndefined();
    expect(thinnedSeries({ time: Float64Array.from([0, 1, 2]) }, 1000).time).toEqual([0, 1, 2]);
  });
});
