import type { RunFrame } from '@kinetwin/shared/protocol/run-events';
import { MAX_RECORDED_SAMPLES, RunRecord, latestFlags } from './run-record';

function frame(t: number[], angle: number[], extra: Partial<RunFrame> = {}): RunFrame {
  const zeros = () => t.map(() => 0);
  return { runId: 'r', t, angle, velocity: t.map((x) => 2 * x), controllerTorque: zeros(), appliedTorque: t.map((x) => -x), saturating: zeros(), sticking: zeros(), ...extra };
}

describe('RunRecord', () => {
  it('keeps the samples the chart keeps and finds the nearest one', () => {
    const record = new RunRecord(0);
    record.append(frame([0, 0.002, 0.004], [0, 0.1, Number.NaN]));
    record.append(frame([0.002, 0.006], [9, 0.3], { saturating: [0, 1], sticking: [0, 1] }));
    expect(record.size).toBe(3);
    expect(record.lastTime).toBe(0.006);
    expect(record.nearest(0.0025)).toEqual({ t: 0.002, angle: 0.1, velocity: 0.004, controllerTorque: 0, appliedTorque: -0.002, saturating: false, sticking: false });
    // 0.004 lies halfway between 0.002 and 0.006: the earlier sample wins the tie.
    expect(record.nearest(0.004)?.t).toBe(0.002);
    expect(record.nearest(5)).toMatchObject({ t: 0.006, angle: 0.3, saturating: true, sticking: true });
    expect(record.nearest(-1)?.t).toBe(0);
    expect(record.nearest(Number.NaN)).toBeNull();
  });

  it('thins to the chart spacing and grows past its first capacity', () => {
    // Binary fractions, so the spacing test is exact: samples every 1/512 s, kept every 1/128 s.
    const record = new RunRecord(1 / 128);
    const t = Array.from({ length: 5121 }, (_, i) => i / 512);
    record.append(frame(t, t));
    expect(record.size).toBe(1281);
    expect(record.nearest(7.003)?.t).toBe(7);
  });

  it('stops recording at its cap', () => {
    const record = new RunRecord(0);
    const t = Array.from({ length: MAX_RECORDED_SAMPLES + 10 }, (_, i) => i);
    record.append(frame(t, t));
    expect(record.size).toBe(MAX_RECORDED_SAMPLES);
  });

  it('is empty until a sample arrives', () => {
    const record = new RunRecord(0);
    expect(record.nearest(0)).toBeNull();
    expect(record.lastTime).toBe(Number.NEGATIVE_INFINITY);
  });
});

describe('latestFlags', () => {
  it('reads the flags of the newest sample with a finite time', () => {
    expect(latestFlags({ t: [0, 0.002, Number.NaN], saturating: [0, 1, 0], sticking: [1, 0, 1] })).toEqual({ saturating: true, sticking: false });
    expect(latestFlags({ t: [], saturating: [], sticking: [] })).toBeNull();
  });
});
