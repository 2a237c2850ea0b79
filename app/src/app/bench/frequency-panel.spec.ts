import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { Component, effect, input } from '@angular/core';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { By } from '@angular/platform-browser';
import { type FrequencyResponse, frequencyResponseOf } from '@kinetwin/shared/frequency/frequency-response';
import { parseScenario } from '@kinetwin/shared/scenario/parse-scenario';
import type { SineSweepResponse } from '@kinetwin/shared/protocol/check-api';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import type { Parsed } from '@kinetwin/shared/validation/field-errors';
import { BodeChart } from './bode-chart';
import { FrequencyPanel } from './frequency-panel';
import { formatDegrees } from './frequency-readout';
import type { MeasuredOverlay } from './sweep-readout';

/** Takes the chart's place: Plotly does not run under jsdom; every response the panel hands it is recorded. */
@Component({ selector: 'kt-bode-chart', template: '' })
class RecordingBodeChart {
  readonly response = input<FrequencyResponse | null>(null);
  readonly measured = input<MeasuredOverlay | null>(null);
  readonly received: FrequencyResponse[] = [];
  constructor() {
    effect(() => {
      const response = this.response();
      if (response) this.received.push(response);
    });
  }
}

// Invented demo values (the wrist-pitch demo's joint and loop).
function draft(kd: number, mode: 'pid' | 'open-loop' = 'pid'): Parsed<Scenario> {
  return parseScenario({
    kind: 'kinetwin/scenario',
    version: 1,
    name: 'Demo wrist pitch',
    joint: { inertia: 0.012, damping: 0.04, stiffness: 0 },
    controller: mode === 'pid' ? { mode, kp: 6, ki: 1, kd, derivativeOn: 'measurement' } : { mode },
    inputs: mode === 'pid' ? [{ channel: 'reference', shape: 'step', amplitude: 0.5, delay: 0.1 }] : [],
    horizon: 2,
  });
}

function expected(d: Parsed<Scenario>, grid = { from: 0.1, to: 1000, points: 200 }): FrequencyResponse {
  if (!d.ok) throw new Error('fixture invalid');
  const result = frequencyResponseOf(d.value, grid);
  if (!result.ok) throw new Error('grid refused');
  return result.value;
}

describe('FrequencyPanel', () => {
  let fixture: ComponentFixture<FrequencyPanel>;
  let root: HTMLElement;
  const text = (selector: string) => root.querySelector(selector)?.textContent?.replace(/\s+/g, ' ').trim() ?? null;
  const chart = () => fixture.debugElement.query(By.directive(RecordingBodeChart)).componentInstance as RecordingBodeChart;
  const field = (name: string) => root.querySelector<HTMLInputElement>(`input[name="${name}"]`)!;

  /** Lets the engine's import settle and an animation frame pass, then renders. */
  async function nextFrame(): Promise<void> {
    await new Promise((resolve) => setTimeout(resolve));
    await fixture.whenStable();
    await new Promise((resolve) => requestAnimationFrame(resolve));
    await fixture.whenStable();
  }
  /** Waits until the chart has received `count` responses (the engine loads by a dynamic import). */
  async function untilReceived(count: number): Promise<void> {
    for (let i = 0; i < 200 && chart().received.length < count; i++) await nextFrame();
  }
  async function typeGrid(name: string, value: string): Promise<void> {
    field(name).value = value;
    field(name).dispatchEvent(new Event('input'));
    await nextFrame();
  }

  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
    TestBed.overrideComponent(FrequencyPanel, { remove: { imports: [BodeChart] }, add: { imports: [RecordingBodeChart] } });
    fixture = TestBed.createComponent(FrequencyPanel);
    root = fixture.nativeElement;
  });

  it('shows the margins, verdict and notes of the draft and hands the chart its response', async () => {
    fixture.componentRef.setInput('draft', draft(0.4));
    await untilReceived(1);
    const want = expected(draft(0.4));
    expect(chart().received).toHaveLength(1);
    expect(chart().received[0]!.margins).toEqual(want.margins);
    expect(text('[data-test=frequency-verdict]')).toBe('stable loop');
    expect(root.querySelector('[data-test=frequency-verdict]')!.classList).toContain('tone-good');
    expect(text('[data-test=phaseMargin] [data-test=value]')).toBe(formatDegrees(want.margins.phaseMarginDeg!));
    expect(text('[data-test=gainMargin] [data-test=value]')).toBe('unbounded');
    expect(text('[data-test=frequency-notes]')).toBe(want.notes.slice(1).join(' '));
    expect(root.querySelector('[data-test=frequency-caution]')).toBeNull();
    expect(root.querySelector('[data-test=delay-model]')).toBeNull();
  });

  it('computes for the newest draft when several arrive before the next frame', async () => {
    fixture.componentRef.setInput('draft', draft(0.4));
    await untilReceived(1);
    // Three drafts before the next frame: only the last is computed.
    fixture.componentRef.setInput('draft', draft(0.3));
    fixture.componentRef.setInput('draft', draft(0.2));
    fixture.componentRef.setInput('draft', draft(0.15));
    await untilReceived(2);
    await nextFrame();
    expect(chart().received).toHaveLength(2);
    expect(chart().received[1]!.margins).toEqual(expected(draft(0.15)).margins);
    expect(text('[data-test=phaseMargin] [data-test=value]')).toBe(formatDegrees(expected(draft(0.15)).margins.phaseMarginDeg!));
  });

  it('refuses an invalid grid inline, computes nothing for it, and recomputes once it is fixed', async () => {
    fixture.componentRef.setInput('draft', draft(0.4));
    await untilReceived(1);
    await typeGrid('grid-to', '0.05');
    expect(text('[data-test=grid-error-to]')).toBe('must be above from');
    expect(field('grid-to').getAttribute('aria-invalid')).toBe('true');
    expect(text('[data-test=frequency-blocked]')).toContain('Fix the frequency grid');
    await typeGrid('grid-points', 'many');
    expect(text('[data-test=grid-error-points]')).toBe('must be a number, got "many"');
    expect(chart().received).toHaveLength(1);

    await typeGrid('grid-to', '100');
    await typeGrid('grid-points', '50');
    await untilReceived(2);
    expect(root.querySelector('[data-test^=grid-error]')).toBeNull();
    expect(root.querySelector('[data-test=frequency-blocked]')).toBeNull();
    const last = chart().received.at(-1)!;
    expect(last.frequency).toHaveLength(50);
    expect(last.frequency.at(-1)).toBe(100);
  });

  it('keeps the last response, dimmed, while the draft has errors', async () => {
    fixture.componentRef.setInput('draft', draft(0.4));
    await untilReceived(1);
    fixture.componentRef.setInput('draft', { ok: false, errors: [{ field: 'joint.inertia', message: 'inertia must be positive' }] });
    await nextFrame();
    expect(text('[data-test=frequency-blocked]')).toContain('The edited scenario has errors');
    expect(root.querySelector('.readout')!.classList).toContain('is-stale');
    expect(chart().received).toHaveLength(1);
  });

  it("gives a sampled controller's delay model and the Nyquist note", async () => {
    const sampled = parseScenario({
      kind: 'kinetwin/scenario',
      version: 1,
      name: 'Demo sampled wrist',
      joint: { inertia: 0.012, damping: 0.04, stiffness: 0 },
      controller: { mode: 'pid', kp: 6, ki: 1, kd: 0.4, derivativeOn: 'measurement', samplePeriod: 0.001 },
      horizon: 2,
    });
    fixture.componentRef.setInput('draft', sampled);
    await untilReceived(1);
    expect(text('[data-test=delay-model]')).toBe(`Delay model: ${expected(sampled).delayModel}.`);
    expect(text('[data-test=frequency-notes]')).toContain('stability decided by the Nyquist criterion');
  });

  it('says why an open-loop scenario has no margins and no loop or reference trace', async () => {
    fixture.componentRef.setInput('draft', draft(0, 'open-loop'));
    await untilReceived(1);
    expect(chart().received[0]!.loop).toBeNull();
    expect(chart().received[0]!.referenceToAngle).toBeNull();
    expect(text('[data-test=frequency-verdict]')).toContain('open loop');
    expect(root.querySelector('[data-test=margins]')).toBeNull();
    expect(text('[data-test=frequency-paths]')).toMatch(/^Open loop: only torque → angle is drawn/);
  });

  describe('measuring the twin', () => {
    const wrist = draft(0.4);
    // Shaped like the server's answer for the wrist demo on a three-point grid (the closed form
    // itself at the first point, a torque limit bending the second, the third without a figure).
    function answerFor(grid: { from: number; to: number; points: number }): SineSweepResponse {
      const cf = expected(wrist, grid).referenceToAngle!;
      return {
        channel: 'reference',
        amplitude: 0.5,
        elapsedMs: 800,
        points: [
          { frequency: 1, magnitudeDb: cf.magnitudeDb[0]!, phaseDeg: cf.phaseDeg[0]!, distortion: 2e-8, saturated: false, stuck: false, reason: null },
          { frequency: 10, magnitudeDb: -1, phaseDeg: -70, distortion: 0.04, saturated: true, stuck: false, reason: null },
          { frequency: 100, magnitudeDb: null, phaseDeg: null, distortion: null, saturated: false, stuck: false, reason: 'the twin stopped: work budget spent' },
        ],
      };
    }

    it("posts the draft and the panel's grid capped at 40 points, leaving the defaults unsaid", async () => {
      const http = TestBed.inject(HttpTestingController);
      fixture.componentRef.setInput('draft', wrist);
      await untilReceived(1);
      expect(text('[data-test=sweep-grid]')).toBe("On 40 log-spaced frequencies from 0.1 rad/s to 1000 rad/s: the panel's grid, capped at 40 points, because each frequency is a full twin run.");
      expect(text('[data-test=sweep-amplitude-default]')).toBe("default: 0.5 rad, the largest of the scenario's reference terms");
      expect(text('[data-test=sweep-channel] option')).toBe('Default: reference (closed loop)');
      root.querySelector<HTMLButtonElement>('[data-test=measure-twin]')!.click();
      await nextFrame();
      expect(root.querySelector('[data-test=sweep-running]')).not.toBeNull();
      expect(root.querySelector<HTMLButtonElement>('[data-test=measure-twin]')!.disabled).toBe(true);
      const request = http.expectOne('/api/checks/sine-sweep');
      expect(request.request.method).toBe('POST');
      expect(request.request.body).toEqual({ scenario: wrist.ok && wrist.value, from: 0.1, to: 1000, points: 40 });
      request.flush(answerFor({ from: 1, to: 100, points: 3 }));
      await nextFrame();
      expect(root.querySelector('[data-test=sweep-running]')).toBeNull();
      http.verify();
    });

    it('draws the answer over the curves, reads each point against the closed form, lists the points without a figure, and goes stale with the draft', async () => {
      const http = TestBed.inject(HttpTestingController);
      fixture.componentRef.setInput('draft', wrist);
      await untilReceived(1);
      await typeGrid('grid-from', '1');
      await typeGrid('grid-to', '100');
      await typeGrid('grid-points', '3');
      field('sweep-amplitude').value = '0.25';
      field('sweep-amplitude').dispatchEvent(new Event('input'));
      await nextFrame();
      root.querySelector<HTMLButtonElement>('[data-test=measure-twin]')!.click();
      await nextFrame();
      const request = http.expectOne('/api/checks/sine-sweep');
      expect(request.request.body).toMatchObject({ from: 1, to: 100, points: 3, amplitude: 0.25 });
      expect('channel' in request.request.body).toBe(false);
      request.flush(answerFor({ from: 1, to: 100, points: 3 }));
      await nextFrame();

      const overlay = fixture.debugElement.query(By.directive(RecordingBodeChart)).componentInstance.measured() as MeasuredOverlay;
      expect(overlay).toMatchObject({ path: 'referenceToAngle', frequency: [1, 10, 100], stale: false });
      const rows = root.querySelectorAll('[data-test=sweep-point]');
      expect(rows).toHaveLength(2);
      expect(rows[0]!.querySelector('[data-test=magnitude-gap]')!.textContent).toBe('+0 dB');
      expect(rows[1]!.querySelector('[data-test=flags]')!.textContent).toBe('torque limit');
      expect(rows[1]!.querySelector('[data-test=distortion]')!.textContent).toBe('4 %');
      expect(text('[data-test=sweep-unmeasured]')).toBe('100 rad/s: the twin stopped: work budget spent');
      expect(text('[data-test=sweep-summary]')).toContain('2 of 3 frequencies measured');
      expect(root.querySelector('[data-test=sweep-stale]')).toBeNull();

      fixture.componentRef.setInput('draft', draft(0.3));
      await nextFrame();
      expect(root.querySelector('[data-test=sweep-stale]')).not.toBeNull();
      expect((fixture.debugElement.query(By.directive(RecordingBodeChart)).componentInstance.measured() as MeasuredOverlay).stale).toBe(true);
      http.verify();
    });

    it('offers no reference channel in open loop and names the torque default there', async () => {
      fixture.componentRef.setInput('draft', draft(0, 'open-loop'));
      await untilReceived(1);
      const options = [...root.querySelectorAll<HTMLOptionElement>('[data-test=sweep-channel] option')];
      expect(options.map((o) => [o.value, o.textContent!.trim(), o.disabled])).toEqual([
        ['default', 'Default: torque (open loop)', false],
        ['reference', 'reference → angle (closed loop only)', true],
        ['torque', 'torque → angle', false],
      ]);
      expect(text('[data-test=sweep-amplitude-default]')).toBe('default: 1 N·m: the scenario has no torque term to take it from');
      expect(root.querySelector<HTMLButtonElement>('[data-test=measure-twin]')!.disabled).toBe(false);
    });

    it("shows the server's refusal with its field errors, and refuses a bad amplitude before sending", async () => {
      const http = TestBed.inject(HttpTestingController);
      fixture.componentRef.setInput('draft', wrist);
      await untilReceived(1);
      field('sweep-amplitude').value = '-2';
      field('sweep-amplitude').dispatchEvent(new Event('input'));
      await nextFrame();
      expect(text('[data-test=sweep-error-amplitude]')).toBe('must be positive');
      expect(root.querySelector<HTMLButtonElement>('[data-test=measure-twin]')!.disabled).toBe(true);
      field('sweep-amplitude').value = '';
      field('sweep-amplitude').dispatchEvent(new Event('input'));
      await nextFrame();
      root.querySelector<HTMLButtonElement>('[data-test=measure-twin]')!.click();
      await nextFrame();
      http
        .expectOne('/api/checks/sine-sweep')
        .flush(
          { error: { code: 'bad_request', message: "The twin's response cannot be measured; nothing was run.", fields: [{ field: '', message: 'the loop is unstable: there is no steady response to measure' }] } },
          { status: 400, statusText: 'Bad Request' },
        );
      await nextFrame();
      expect(text('[data-test=sweep-error]')).toBe("The twin's response cannot be measured; nothing was run. the loop is unstable: there is no steady response to measure");
      expect(root.querySelector<HTMLButtonElement>('[data-test=measure-twin]')!.disabled).toBe(false);
      http.verify();
    });
  });
});
