import { Component, effect, input } from '@angular/core';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { By } from '@angular/platform-browser';
import { type RootLocus, rootLocus } from '@kinetwin/shared/frequency/root-locus';
import { parseScenario } from '@kinetwin/shared/scenario/parse-scenario';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import type { Parsed } from '@kinetwin/shared/validation/field-errors';
import { RootLocusChart } from './root-locus-chart';
import { RootLocusPanel } from './root-locus-panel';

/** Takes the chart's place: Plotly does not run under jsdom; every locus the panel hands it is recorded. */
@Component({ selector: 'kt-root-locus-chart', template: '' })
class RecordingLocusChart {
  readonly locus = input<RootLocus | null>(null);
  readonly received: RootLocus[] = [];
  constructor() {
    effect(() => {
      const locus = this.locus();
      if (locus) this.received.push(locus);
    });
  }
}

// Invented demo values (the wrist-pitch demo's joint and loop).
function draft(kp: number, mode: 'pid' | 'open-loop' = 'pid'): Parsed<Scenario> {
  return parseScenario({
    kind: 'kinetwin/scenario',
    version: 1,
    name: 'Demo wrist pitch',
    joint: { inertia: 0.012, damping: 0.04, stiffness: 0 },
    controller: mode === 'pid' ? { mode, kp, ki: 1, kd: 0.4, derivativeOn: 'measurement' } : { mode },
    horizon: 2,
  });
}

describe('RootLocusPanel', () => {
  let fixture: ComponentFixture<RootLocusPanel>;
  let root: HTMLElement;
  const text = (selector: string) => root.querySelector(selector)?.textContent?.replace(/\s+/g, ' ').trim() ?? null;
  const chart = () => fixture.debugElement.query(By.directive(RecordingLocusChart)).componentInstance as RecordingLocusChart;
  const field = (name: string) => root.querySelector<HTMLInputElement | HTMLSelectElement>(`[name="${name}"]`)!;

  async function settle(): Promise<void> {
    for (let i = 0; i < 5; i++) {
      await new Promise((resolve) => setTimeout(resolve));
      await fixture.whenStable();
    }
  }
  async function type(name: string, value: string): Promise<void> {
    const element = field(name);
    element.value = value;
    element.dispatchEvent(new Event(element instanceof HTMLSelectElement ? 'change' : 'input'));
    await settle();
  }
  async function untilDrawn(count: number): Promise<void> {
    await settle();
    for (let i = 0; i < 200 && chart().received.length < count; i++) await settle();
  }

  beforeEach(() => {
    TestBed.overrideComponent(RootLocusPanel, { remove: { imports: [RootLocusChart] }, add: { imports: [RecordingLocusChart] } });
    fixture = TestBed.createComponent(RootLocusPanel);
    root = fixture.nativeElement;
  });

  it("draws the locus of kp over 0 … 3× the draft's value, with the draft's poles", async () => {
    fixture.componentRef.setInput('draft', draft(6));
    await untilDrawn(1);
    const d = draft(6);
    if (!d.ok) throw new Error('fixture invalid');
    const want = rootLocus(d.value, { gain: 'kp', from: 0, to: 18, points: 200, spacing: 'linear' });
    if (!want.ok) throw new Error('refused');
    expect(chart().received.at(-1)).toEqual(want.value);
    expect(text('[data-test=locus-default-range]')).toBe("Blank ends take the default range, 0 to 18 (3× the draft's kp).");
    expect(root.querySelectorAll('[data-test=locus-current-poles] li').length).toBeGreaterThan(0);
    expect(text('h3')).toBe("Poles at kp = 6 (the draft's)");
  });

  it('follows the gain, the range and the spacing, and keeps the last locus while a field is wrong', async () => {
    fixture.componentRef.setInput('draft', draft(6));
    await untilDrawn(1);
    await type('locus-gain', 'kd');
    await type('locus-spacing', 'log');
    // Log spacing from the default 0 is refused by the locus itself, under its field.
    expect(text('[data-test=locus-error-from]')).toBe('must be above zero for log spacing');
    expect(text('[data-test=locus-blocked]')).toContain('Fix the range');
    const before = chart().received.length;
    await type('locus-from', '0.01');
    await untilDrawn(before + 1);
    const last = chart().received.at(-1)!;
    expect(last.gain).toBe('kd');
    expect(last.values[0]).toBe(0.01);
    expect(last.values.at(-1)).toBeCloseTo(1.2, 12);
    expect(last.values[1]! / last.values[0]!).toBeCloseTo(last.values[2]! / last.values[1]!, 9);
    expect(root.querySelector('[data-test=locus-blocked]')).toBeNull();
  });

  it('says plainly that an open loop has no root locus', async () => {
    fixture.componentRef.setInput('draft', draft(0, 'open-loop'));
    await settle();
    expect(text('[data-test=locus-open-loop]')).toContain('no controller gain to vary');
    expect(fixture.debugElement.query(By.directive(RecordingLocusChart))).toBeNull();
  });
});
