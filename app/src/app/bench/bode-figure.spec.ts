import { type FrequencyResponse, frequencyResponseOf } from '@kinetwin/shared/frequency/frequency-response';
import { parseScenario } from '@kinetwin/shared/scenario/parse-scenario';
import { bodeFigure, valueAtFrequency } from './bode-figure';
import type { MeasuredOverlay } from './sweep-readout';

// Invented demo values: integral action only on J = 1, b = 3, k = 2 gives L = 1/(s(s+1)(s+2)),
// phase crossover at √2 rad/s (the classic third-order example; common practice).
function responseOf(controller: Record<string, unknown>, grid = { from: 0.01, to: 100, points: 120 }): FrequencyResponse {
  const parsed = parseScenario({ kind: 'kinetwin/scenario', version: 1, name: 'Demo loop', joint: { inertia: 1, damping: 3, stiffness: 2 }, controller, horizon: 1 });
  if (!parsed.ok) throw new Error('fixture invalid');
  const result = frequencyResponseOf(parsed.value, grid);
  if (!result.ok) throw new Error('grid refused');
  return result.value;
}

const thirdOrder = () => responseOf({ mode: 'pid', kp: 0, ki: 1, kd: 0 });

describe('bodeFigure', () => {
  it('draws each path as magnitude over phase on one log frequency axis, one legend entry per path', () => {
    const response = thirdOrder();
    const { data, layout } = bodeFigure(response);
    const paths = data.filter((trace) => trace.mode === 'lines');
    expect(paths.map((trace) => [trace.name, trace.yaxis, trace.showlegend ?? true])).toEqual([
      ['loop L(jω)', 'y', true],
      ['loop L(jω)', 'y2', false],
      ['reference → angle', 'y', true],
      ['reference → angle', 'y2', false],
      ['torque → angle', 'y', true],
      ['torque → angle', 'y2', false],
    ]);
    expect(paths.every((trace) => trace.xaxis === 'x' && trace.x === response.frequency)).toBe(true);
    expect(paths[0]!.y).toBe(response.loop!.magnitudeDb);
    expect(paths[1]!.y).toBe(response.loop!.phaseDeg);
    // Each hover reads frequency, magnitude and phase: the other panel's value rides as customdata.
    expect(paths[0]!.customdata).toBe(response.loop!.phaseDeg);
    expect(paths[1]!.customdata).toBe(response.loop!.magnitudeDb);
    expect(paths[0]!.hovertemplate).toBe('loop L(jω)<br>ω = %{x:.4g} rad/s<br>magnitude %{y:.4g} dB<br>phase %{customdata:.4g}°<extra></extra>');
    expect(paths[1]!.hovertemplate).toBe('loop L(jω)<br>ω = %{x:.4g} rad/s<br>magnitude %{customdata:.4g} dB<br>phase %{y:.4g}°<extra></extra>');
    expect(layout.xaxis).toMatchObject({ type: 'log', anchor: 'y2', range: [-2, 2] });
    expect(layout.yaxis!.domain![0]).toBeGreaterThan((layout['yaxis2'] as { domain: number[] }).domain[1]!);
  });

  it('keeps null cells as gaps', () => {
    const response = thirdOrder();
    const gapped: FrequencyResponse = { ...response, torqueToAngle: { magnitudeDb: response.torqueToAngle.magnitudeDb.map((v, i) => (i === 5 ? null : v)), phaseDeg: response.torqueToAngle.phaseDeg.map((v, i) => (i === 5 ? null : v)) } };
    const torque = bodeFigure(gapped).data.filter((trace) => trace.name === 'torque → angle');
    expect(torque.map((trace) => (trace.y as (number | null)[])[5])).toEqual([null, null]);
    expect(torque.every((trace) => trace.connectgaps === false)).toBe(true);
  });

  it('marks the phase crossover on the loop phase and draws the 0 dB and −180° lines', () => {
    const response = thirdOrder();
    const { data, layout } = bodeFigure(response);
    const marker = data.find((trace) => trace.name === 'phase crossover')!;
    expect(marker.yaxis).toBe('y2');
    expect((marker.x as number[])[0]).toBe(response.margins.phaseCrossover);
    expect(Math.abs((marker.y as number[])[0]! + 180)).toBeLessThan(1);
    expect(marker.hovertemplate).toContain('gain margin 15.56 dB');
    // Integral action only: |L| = 1 near 0.45 rad/s, inside the grid, so the gain crossover is marked at 0 dB.
    const gainMarker = data.find((trace) => trace.name === 'gain crossover')!;
    expect(gainMarker.y).toEqual([0]);
    expect(gainMarker.yaxis).toBe('y');
    const levels = layout.shapes!.filter((shape) => shape.xref === 'paper').map((shape) => [shape.yref, shape.y0]);
    expect(levels).toEqual([
      ['y', 0],
      ['y2', -180],
    ]);
    const crossings = layout.shapes!.filter((shape) => shape.xref === 'x').map((shape) => shape.x0);
    expect(crossings).toEqual([response.margins.gainCrossover, response.margins.phaseCrossover]);
    // Annotations on a log axis sit at log10 of the frequency.
    expect(layout.annotations!.map((a) => [a.text, a.x])).toEqual([
      ['gain crossover', Math.log10(response.margins.gainCrossover!)],
      ['phase crossover', Math.log10(response.margins.phaseCrossover!)],
    ]);
  });

  it('leaves a crossover outside the grid off the chart', () => {
    const { data, layout } = bodeFigure(responseOf({ mode: 'pid', kp: 0, ki: 1, kd: 0 }, { from: 10, to: 1000, points: 50 }));
    expect(data.some((trace) => trace.mode === 'markers')).toBe(false);
    expect(layout.shapes!.filter((shape) => shape.xref === 'x')).toEqual([]);
  });

  it("draws the twin's measured points as markers on both panels of their path, after the curves, faded when stale", () => {
    const response = thirdOrder();
    const measured: MeasuredOverlay = { path: 'referenceToAngle', frequency: [0.1, 1, 10], magnitudeDb: [0.1, -2, null], phaseDeg: [-5, -90, null], distortion: [1e-6, 0.2, null], stale: false };
    const { data } = bodeFigure(response, measured);
    const markers = data.filter((trace) => trace.legendgroup === 'measured');
    expect(data.indexOf(markers[0]!)).toBeGreaterThan(data.findIndex((trace) => trace.name === 'torque → angle'));
    expect(markers.map((trace) => [trace.name, trace.mode, trace.yaxis, trace.showlegend ?? true, trace.opacity])).toEqual([
      ['measured (twin)', 'markers', 'y', true, 1],
      ['measured (twin)', 'markers', 'y2', false, 1],
    ]);
    expect(markers[0]!.x).toBe(measured.frequency);
    expect(markers[0]!.y).toBe(measured.magnitudeDb);
    expect(markers[1]!.y).toBe(measured.phaseDeg);
    // Each marker's hover reads the measured magnitude, phase and distortion (in %).
    expect((markers[0]!.customdata as unknown[])[1]).toEqual([-2, -90, 20]);
    expect(markers[0]!.hovertemplate).toContain('reference → angle');
    const stale = bodeFigure(response, { ...measured, stale: true }).data.filter((trace) => trace.legendgroup === 'measured');
    expect(stale.map((trace) => [trace.name, trace.opacity])).toEqual([
      ['measured (twin, stale)', 0.35],
      ['measured (twin, stale)', 0.35],
    ]);
  });

  it('leaves measured points off a response without their path', () => {
    const parsed = parseScenario({ kind: 'kinetwin/scenario', version: 1, name: 'Demo free inertia', joint: { inertia: 0.01, damping: 0.1, stiffness: 1 }, controller: { mode: 'open-loop' }, horizon: 1 });
    if (!parsed.ok) throw new Error('fixture invalid');
    const result = frequencyResponseOf(parsed.value, { from: 0.1, to: 1000, points: 40 });
    if (!result.ok) throw new Error('grid refused');
    const overlay: MeasuredOverlay = { path: 'referenceToAngle', frequency: [1], magnitudeDb: [0], phaseDeg: [0], distortion: [0], stale: false };
    expect(bodeFigure(result.value, overlay).data.some((trace) => trace.legendgroup === 'measured')).toBe(false);
    expect(bodeFigure(result.value, { ...overlay, path: 'torqueToAngle' }).data.filter((trace) => trace.legendgroup === 'measured')).toHaveLength(2);
  });

  it('draws only torque → angle in open loop', () => {
    const parsed = parseScenario({ kind: 'kinetwin/scenario', version: 1, name: 'Demo free inertia', joint: { inertia: 0.01, damping: 0, stiffness: 0 }, controller: { mode: 'open-loop' }, horizon: 1 });
    if (!parsed.ok) throw new Error('fixture invalid');
    const result = frequencyResponseOf(parsed.value, { from: 0.1, to: 1000, points: 40 });
    if (!result.ok) throw new Error('grid refused');
    const { data } = bodeFigure(result.value);
    expect(data.map((trace) => trace.name)).toEqual(['torque → angle', 'torque → angle']);
  });
});

describe('valueAtFrequency', () => {
  it('interpolates linearly in log ω and gives null outside the grid or beside a gap', () => {
    const w = [1, 10, 100];
    expect(valueAtFrequency(w, [0, -20, -40], Math.sqrt(10))).toBeCloseTo(-10, 12);
    expect(valueAtFrequency(w, [0, -20, -40], 100)).toBe(-40);
    expect(valueAtFrequency(w, [0, -20, -40], 1)).toBe(0);
    expect(valueAtFrequency(w, [0, -20, -40], 0.5)).toBeNull();
    expect(valueAtFrequency(w, [0, null, -40], 50)).toBeNull();
  });
});
