import { Component, input } from '@angular/core';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { type ComponentFixture, DeferBlockBehavior, TestBed } from '@angular/core/testing';
import { By } from '@angular/platform-browser';
import { provideRouter } from '@angular/router';
import { responseAt, solveClosedForm } from '@kinetwin/shared/closed-form/index';
import type { ScenarioDetail } from '@kinetwin/shared/protocol/api-types';
import type { RunControlState, RunFrame, RunSample } from '@kinetwin/shared/protocol/run-events';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import type { Parsed } from '@kinetwin/shared/validation/field-errors';
import { RUN_SOCKET_FACTORY, type RunSocketClient } from '../core/run-socket-factory';
import { FakeRunSocketClient } from '../core/testing/fake-run-socket-client';
import { AngleChart } from './angle-chart';
import { Bench } from './bench';
import { CLOSED_FORM_DEBOUNCE_MS } from './bench-closed-form';
import type { ChartFeed } from './chart-feed';
import { joinBatches } from './chart-feed';
import { CLOSED_FORM_TRACE_INTERVALS, type ClosedFormTrace } from './closed-form-view';
import { FrequencyPanel } from './frequency-panel';

/** Takes the chart's place: Plotly does not run under jsdom, and what the bench feeds it is the point. */
@Component({ selector: 'kt-angle-chart', template: '' })
class RecordingChart {
  readonly horizon = input.required<number>();
  readonly feed = input.required<ChartFeed>();
  readonly closedForm = input<ClosedFormTrace | null>(null);
  readonly note = input<string | null>(null);
}

/** Takes the frequency panel's place (its chart needs Plotly): what the bench hands it is the point. */
@Component({ selector: 'kt-frequency-panel', template: '' })
class RecordingFrequencyPanel {
  readonly draft = input.required<Parsed<Scenario> | null>();
}

// Invented demo values.
const detail: ScenarioDetail = {
  id: 5,
  name: 'Demo wrist pitch',
  ownerName: 'Demo Engineer',
  updatedAt: '2026-03-01T10:00:00.000Z',
  scenario: {
    kind: 'kinetwin/scenario',
    version: 1,
    name: 'Demo wrist pitch',
    notes: '',
    joint: { inertia: 0.01, damping: 0.05, stiffness: 0, gearRatio: 1 },
    controller: { mode: 'pid', kp: 2, ki: 0, kd: 0.1, derivativeOn: 'error', derivativeFilter: 0, samplePeriod: null },
    initial: { angle: 0.1, velocity: 0 },
    inputs: [{ channel: 'reference', shape: 'step', amplitude: 0.5, delay: 0 }],
    horizon: 2,
    limits: { overshootPercent: null, settlingTime: null, steadyStateError: null },
    nonlinear: {},
  },
};

function frame(runId: string, t: number[], angle: number[], extra: Partial<RunFrame> = {}): RunFrame {
  const zeros = () => t.map(() => 0);
  return { runId, t, angle, velocity: zeros(), controllerTorque: zeros(), appliedTorque: zeros(), saturating: zeros(), sticking: zeros(), ...extra };
}

// A busy 2-core machine loads the closed-form engine slowly on first use; the tests wait on events, not time.
describe('Bench', { timeout: 30_000 }, () => {
  let fixture: ComponentFixture<Bench>;
  let http: HttpTestingController;
  let client: FakeRunSocketClient;
  let page: HTMLElement;

  const text = (selector: string) => page.querySelector(selector)?.textContent?.trim() ?? null;
  const button = (name: string) => page.querySelector<HTMLButtonElement>(`[data-test=${name}]`)!;
  const chart = () => fixture.debugElement.query(By.directive(RecordingChart)).componentInstance as RecordingChart;
  const chartFeed = () => chart().feed();
  const field = (name: string) => page.querySelector<HTMLInputElement>(`input[name="${name}"]`)!;
  async function settle(): Promise<void> {
    await new Promise((resolve) => setTimeout(resolve));
    await fixture.whenStable();
  }
  /** Waits out the closed form's debounce (and the engine's first load). */
  async function settleClosedForm(): Promise<void> {
    for (let i = 0; i < 50; i++) {
      await new Promise((resolve) => setTimeout(resolve, CLOSED_FORM_DEBOUNCE_MS + 20));
      await fixture.whenStable();
      if (!page.textContent?.includes('Loading the closed-form engine')) return;
    }
  }
  async function type(name: string, text: string): Promise<void> {
    field(name).value = text;
    field(name).dispatchEvent(new Event('input'));
    await fixture.whenStable();
  }
  async function finishRun(runId: string): Promise<void> {
    client.last('run:start').ack({ status: 'ok', data: { runId, scenarioName: 'Demo wrist pitch', horizon: 2, dt: 0.002 } });
    await settle();
    client.receive('run:end', { runId, reason: 'finished', message: 'horizon reached', simulatedTime: 2 });
    await settle();
  }

  beforeEach(async () => {
    client = new FakeRunSocketClient();
    TestBed.configureTestingModule({
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: RUN_SOCKET_FACTORY, useValue: () => client as unknown as RunSocketClient },
      ],
      // The 3D view needs WebGL, which jsdom lacks; its placeholder stands in.
      deferBlockBehavior: DeferBlockBehavior.Manual,
    });
    TestBed.overrideComponent(Bench, { remove: { imports: [AngleChart, FrequencyPanel] }, add: { imports: [RecordingChart, RecordingFrequencyPanel] } });
    await TestBed.compileComponents();
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(Bench);
    fixture.componentRef.setInput('id', '5');
    page = fixture.nativeElement;
    await fixture.whenStable();
  });

  afterEach(() => http.verify());

  it('shows the scenario, runs it, follows the frames and ends finished', async () => {
    http.expectOne('/api/scenarios/5').flush(detail);
    await fixture.whenStable();
    expect(text('[data-test=bench-title]')).toBe('Demo wrist pitch');
    expect(page.textContent).toContain('reference step 0.5 rad at t = 0 s');
    expect(text('[data-test=run-status]')).toBe('idle');
    expect(button('stop').disabled).toBe(true);

    button('run').click();
    await fixture.whenStable();
    expect(client.last('run:start').payload).toEqual({ scenarioId: 5 });
    expect(text('[data-test=run-status]')).toBe('starting');
    expect(button('run').disabled).toBe(true);

    client.last('run:start').ack({ status: 'ok', data: { runId: 'r1', scenarioName: 'Demo wrist pitch', horizon: 2, dt: 0.002 } });
    await settle();
    expect(text('[data-test=run-status]')).toBe('running t = 0.00 s');
    expect(button('stop').disabled).toBe(false);

    client.receive('run:frame', frame('r1', [0, 0.002, 0.004], [0.1, 0.11, Number.NaN]));
    client.receive('run:frame', frame('r1', [0.006, 0.008], [0.13, 0.15]));
    await fixture.whenStable();
    expect(text('[data-test=run-status]')).toBe('running t = 0.01 s');
    const feed = chartFeed();
    expect(joinBatches(feed.batches, 0, feed.size)).toEqual({ t: [0, 0.002, 0.006, 0.008], angle: [0.1, 0.11, 0.13, 0.15] });

    client.receive('run:end', { runId: 'r1', reason: 'finished', message: 'horizon reached', simulatedTime: 2 });
    await fixture.whenStable();
    expect(text('[data-test=run-status]')).toBe('finished');
    expect(button('run').disabled).toBe(false);

    // Run again: a fresh chart log, and the server is asked for a new run.
    button('run').click();
    await fixture.whenStable();
    expect(chartFeed().size).toBe(0);
    expect(chartFeed().run).toBe(feed.run + 1);
    expect(client.emitted.filter((e) => e.event === 'run:start')).toHaveLength(2);
  });

  it('lists the field errors of a refused run', async () => {
    http.expectOne('/api/scenarios/5').flush(detail);
    await fixture.whenStable();
    button('run').click();
    await fixture.whenStable();
    client.last('run:start').ack({ status: 'error', errors: [{ field: 'scenario.joint.inertia', message: 'inertia must be positive' }] });
    await settle();

    expect(text('[data-test=run-status]')).toBe('error: inertia must be positive');
    expect(text('[data-test=run-errors]')).toContain('scenario.joint.inertia');
    expect(button('run').disabled).toBe(false);
  });

  it('shows the stopped-at-bound message the server sends', async () => {
    http.expectOne('/api/scenarios/5').flush(detail);
    await fixture.whenStable();
    button('run').click();
    client.last('run:start').ack({ status: 'ok', data: { runId: 'r1', scenarioName: 'Demo wrist pitch', horizon: 2, dt: 0.002 } });
    await settle();
    client.receive('run:end', { runId: 'r1', reason: 'bound', message: 'angle passed 6.28 rad at t = 0.84 s', simulatedTime: 0.84 });
    await fixture.whenStable();
    expect(text('[data-test=run-status]')).toBe('stopped at bound: angle passed 6.28 rad at t = 0.84 s');
  });

  it("shows the server's message for a scenario it cannot find", async () => {
    http.expectOne('/api/scenarios/5').flush({ error: { code: 'not_found', message: 'No scenario has id 5.' } }, { status: 404, statusText: 'Not Found' });
    await fixture.whenStable();
    expect(text('[data-test=bench-error]')).toBe('No scenario has id 5.');
    expect(page.querySelector('[data-test=run]')).toBeNull();
  });

  it('draws the closed form of the scenario over the chart and in the panel', async () => {
    http.expectOne('/api/scenarios/5').flush(detail);
    await settleClosedForm();
    expect(chart().closedForm()?.t.length).toBe(CLOSED_FORM_TRACE_INTERVALS + 1);
    expect(chart().closedForm()?.angle[0]).toBeCloseTo(0.1, 12);
    // Type 1 loop (no spring, integrating joint): the 0.5 rad step settles at 0.5 rad.
    expect(text('[data-test=final-value]')).toBe('0.5 rad');
    expect(page.querySelector('[data-test=closed-form-panel] [data-test=metrics]')).not.toBeNull();
  });

  it('hands the frequency panel the edited draft, errors included', async () => {
    const frequencyDraft = () => (fixture.debugElement.query(By.directive(RecordingFrequencyPanel)).componentInstance as RecordingFrequencyPanel).draft();
    http.expectOne('/api/scenarios/5').flush(detail);
    await fixture.whenStable();
    expect(frequencyDraft()).toEqual({ ok: true, value: detail.scenario });

    await type('controller.kd', '0.25');
    const edited = frequencyDraft();
    expect(edited?.ok && edited.value.controller.kd).toBe(0.25);

    await type('joint.inertia', '-1');
    expect(frequencyDraft()).toMatchObject({ ok: false, errors: [{ field: 'joint.inertia' }] });
  });

  it('runs the edited scenario inline and the stored one by id', async () => {
    http.expectOne('/api/scenarios/5').flush(detail);
    await fixture.whenStable();

    await type('controller.kp', '3');
    button('run').click();
    await fixture.whenStable();
    const inline = client.last('run:start').payload as { scenario: { controller: { kp: number } }; scenarioId?: number };
    expect(inline.scenarioId).toBeUndefined();
    expect(inline.scenario.controller.kp).toBe(3);
    await finishRun('r1');

    // Typing the saved value back leaves nothing edited in substance: the stored scenario runs.
    await type('controller.kp', '2.0');
    button('run').click();
    await fixture.whenStable();
    expect(client.last('run:start').payload).toEqual({ scenarioId: 5 });
  });

  it('shows an invalid edit under its field, keeps the panel up, refuses to run and resets to saved', async () => {
    http.expectOne('/api/scenarios/5').flush(detail);
    await settleClosedForm();
    const valid = chart().closedForm();
    expect(valid).not.toBeNull();
    expect(chart().note()).toBeNull();

    await type('joint.inertia', '-1');
    await settleClosedForm();
    expect(text('[data-test="field-error-joint.inertia"]')).toBe('inertia must be positive');
    expect(text('[data-test=closed-form-errors]')?.replace(/\s+/g, ' ')).toContain('joint.inertia: inertia must be positive');
    // The chart keeps the last valid closed form and says why it is not the draft's.
    expect(chart().closedForm()).toBe(valid);
    expect(chart().note()).toContain('joint.inertia: inertia must be positive');
    expect(button('run').disabled).toBe(true);

    await type('joint.inertia', 'heavy');
    await settleClosedForm();
    expect(text('[data-test="field-error-joint.inertia"]')).toBe('inertia must be a finite number, got "heavy"');

    button('reset-edits').click();
    await settleClosedForm();
    expect(field('joint.inertia').value).toBe('0.01');
    expect(page.querySelector('[data-test="field-error-joint.inertia"]')).toBeNull();
    expect(text('[data-test=final-value]')).toBe('0.5 rad');
    expect(chart().note()).toBeNull();
    expect(button('run').disabled).toBe(false);
  });

  it('reads the largest twin − closed form residual after a run', async () => {
    http.expectOne('/api/scenarios/5').flush(detail);
    await settleClosedForm();
    expect(page.querySelector('[data-test=residual]')).toBeNull();
    button('run').click();
    client.last('run:start').ack({ status: 'ok', data: { runId: 'r1', scenarioName: 'Demo wrist pitch', horizon: 2, dt: 0.002 } });
    await settle();

    const solved = solveClosedForm(detail.scenario);
    if (!solved.ok) throw new Error('the demo scenario has no closed form');
    const t = Array.from({ length: 501 }, (_, i) => i * 0.002);
    // The twin as the closed form, but 2 mrad off at t = 0.5 s.
    const angle = t.map((x, i) => responseAt(solved.value.plan, x, 0) + (i === 250 ? 0.002 : 0));
    client.receive('run:frame', frame('r1', t.slice(0, 300), angle.slice(0, 300)));
    client.receive('run:frame', frame('r1', t.slice(300), angle.slice(300)));
    client.receive('run:end', { runId: 'r1', reason: 'stopped', message: 'stopped by the user', simulatedTime: 1 });
    await settle();
    await settle();

    expect(text('[data-test=residual]')).toContain('Last run: max |twin − closed form| = 0.002 rad at t = 0.5 s');
    expect(text('[data-test=residual]')).toContain('501 twin samples');
  });
  describe('live-run controls', () => {
    const started = { status: 'ok' as const, data: { runId: 'r1', scenarioName: 'Demo wrist pitch', horizon: 2, dt: 0.002 } };
    const control = (state: RunControlState['state'], simulatedTime: number, speed = 1) => ({ status: 'ok' as const, data: { runId: 'r1', state, speed, simulatedTime } });
    const t = Array.from({ length: 301 }, (_, i) => i * 0.002);
    const kickButton = (name: string) => page.querySelector<HTMLButtonElement>(`[data-test=kick-panel] [data-test=${name}]`);
    const scrubInput = () => page.querySelector<HTMLInputElement>('[data-test=scrub]');
    const readout = () =>
      [...page.querySelectorAll('[data-test=scrub-readout] [data-reading]')].map((row) => `${row.querySelector('dt')?.textContent?.trim()} ${row.querySelector('dd')?.textContent?.trim()}`).join('; ');

    async function startLive(): Promise<void> {
      http.expectOne('/api/scenarios/5').flush(detail);
      await fixture.whenStable();
      button('run').click();
      client.last('run:start').ack(started);
      await settle();
    }
    async function scrubTo(time: number): Promise<void> {
      const input = scrubInput()!;
      input.value = String(time);
      input.dispatchEvent(new Event('input'));
      input.dispatchEvent(new Event('change'));
      await fixture.whenStable();
    }

    it('keeps the live controls disabled until a run is live', async () => {
      http.expectOne('/api/scenarios/5').flush(detail);
      await fixture.whenStable();
      expect(button('pause').disabled).toBe(true);
      // The amplitude can be set up before Run; only the kick buttons wait for a live run.
      expect(field('kick.amplitude').disabled).toBe(false);
      for (const name of ['kick-torque-impulse', 'kick-torque-step', 'kick-reference-step']) expect(kickButton(name)?.disabled).toBe(true);
      expect(scrubInput()).toBeNull();

      button('run').click();
      await fixture.whenStable();
      expect(text('[data-test=run-status]')).toBe('starting');
      expect(button('pause').disabled).toBe(true);
      expect(kickButton('kick-torque-step')?.disabled).toBe(true);

      client.last('run:start').ack(started);
      await settle();
      expect(button('pause').disabled).toBe(false);
      expect(kickButton('kick-torque-step')?.disabled).toBe(false);
      expect(field('kick.amplitude').disabled).toBe(false);

      client.receive('run:end', { runId: 'r1', reason: 'finished', message: 'horizon reached', simulatedTime: 2 });
      await settle();
      expect(button('pause').disabled).toBe(true);
      expect(kickButton('kick-torque-impulse')?.disabled).toBe(true);
      expect(client.emitted.filter((e) => e.event === 'run:pause' || e.event === 'run:kick')).toEqual([]);
    });

    it('pauses, resumes and changes speed, and sends the chosen speed with the next run', async () => {
      http.expectOne('/api/scenarios/5').flush(detail);
      await fixture.whenStable();
      const speed = page.querySelector<HTMLSelectElement>('[data-test=speed]')!;
      expect([...speed.options].map((o) => o.textContent?.trim())).toEqual(['×0.1', '×0.5', '×1', '×2', '×5', '×10', 'max']);
      expect(speed.value).toBe('1');
      speed.value = '5';
      speed.dispatchEvent(new Event('change'));
      await fixture.whenStable();
      // No run is live: the speed waits for the next Run.
      expect(client.emitted.filter((e) => e.event === 'run:speed')).toEqual([]);

      button('run').click();
      await fixture.whenStable();
      expect(client.last('run:start').payload).toEqual({ scenarioId: 5, speed: 5 });
      client.last('run:start').ack(started);
      await settle();
      client.receive('run:frame', frame('r1', [0, 0.002, 0.004], [0.1, 0.11, 0.12]));
      await fixture.whenStable();

      button('pause').click();
      expect(client.last('run:pause').payload).toEqual({ runId: 'r1' });
      client.last('run:pause').ack(control('paused', 0.004, 5));
      await settle();
      expect(text('[data-test=run-status]')).toBe('paused t = 0.00 s');
      expect(page.querySelector('[data-test=pause]')).toBeNull();
      expect(button('stop').disabled).toBe(false);
      expect(button('run').disabled).toBe(true);

      speed.value = '0';
      speed.dispatchEvent(new Event('change'));
      expect(client.last('run:speed').payload).toEqual({ runId: 'r1', speed: 0 });
      client.last('run:speed').ack(control('paused', 0.004, 0));
      await settle();

      button('resume').click();
      expect(client.last('run:resume').payload).toEqual({ runId: 'r1' });
      client.last('run:resume').ack(control('running', 0.004, 0));
      await settle();
      client.receive('run:frame', frame('r1', [0.006, 0.5], [0.13, 0.4]));
      await fixture.whenStable();
      expect(text('[data-test=run-status]')).toBe('running t = 0.50 s');
      expect(button('pause').disabled).toBe(false);
    });

    it('shows the errors of a refused control', async () => {
      await startLive();
      button('pause').click();
      client.last('run:pause').ack({ status: 'error', errors: [{ field: 'runId', message: 'no live run has that id' }] });
      await settle();
      expect(text('[data-test=run-errors]')).toContain('no live run has that id');
      expect(text('[data-test=run-status]')).toBe('running t = 0.00 s');
    });

    it('adds a kick to the closed form by superposition and lists it, without editing the scenario', async () => {
      http.expectOne('/api/scenarios/5').flush(detail);
      await settleClosedForm();
      const before = Float64Array.from(chart().closedForm()!.angle);
      button('run').click();
      client.last('run:start').ack(started);
      await settle();

      await type('kick.amplitude', '0.02');
      kickButton('kick-torque-impulse')!.click();
      expect(client.last('run:kick').payload).toEqual({ runId: 'r1', kick: { channel: 'torque', shape: 'impulse', amplitude: 0.02 } });
      const term = { channel: 'torque' as const, shape: 'impulse' as const, amplitude: 0.02, delay: 0.3 };
      client.last('run:kick').ack({ status: 'ok', data: { runId: 'r1', term } });
      await settleClosedForm();

      expect([...page.querySelectorAll('[data-test=kick-list] li')].map((li) => li.textContent?.trim())).toEqual(['torque impulse 0.02 N·m·s at t = 0.3 s']);
      expect(button('reset-edits').disabled).toBe(true);
      // The drawn closed form is the scenario's with the kick appended to its inputs.
      const kicked = solveClosedForm({ ...detail.scenario, inputs: [...detail.scenario.inputs, term] });
      if (!kicked.ok) throw new Error('the kicked scenario has no closed form');
      const trace = chart().closedForm()!;
      const late = trace.t.findIndex((x) => x >= 0.6);
      expect(trace.angle[late]).toBeCloseTo(responseAt(kicked.value.plan, trace.t[late], 0), 12);
      expect(Math.abs(trace.angle[late] - before[late])).toBeGreaterThan(1e-4);
      // Before the kick lands, superposition leaves the response as it was.
      const early = trace.t.findIndex((x) => x >= 0.2);
      expect(trace.angle[early]).toBeCloseTo(before[early], 12);

      // A twin that took the kick agrees with that closed form: the residual stays at zero.
      const twin = Array.from({ length: 1001 }, (_, i) => i * 0.002);
      client.receive('run:frame', frame('r1', twin, twin.map((x) => responseAt(kicked.value.plan, x, 0))));
      client.receive('run:end', { runId: 'r1', reason: 'finished', message: 'horizon reached', simulatedTime: 2 });
      await settle();
      await settle();
      expect(text('[data-test=residual]')).toContain('max |twin − closed form| = 0 rad');

      // A new run starts without the old run's kicks.
      button('run').click();
      await settleClosedForm();
      expect(page.querySelector('[data-test=kick-list]')).toBeNull();
      expect(chart().closedForm()!.angle[late]).toBeCloseTo(before[late], 12);
    });

    it('keeps a finished run\'s kicks as forcing terms of the draft: listed, editable, run inline, dropped by reset', async () => {
      http.expectOne('/api/scenarios/5').flush(detail);
      await fixture.whenStable();
      button('run').click();
      client.last('run:start').ack(started);
      await settle();
      kickButton('kick-torque-impulse')!.click();
      const term = { channel: 'torque' as const, shape: 'impulse' as const, amplitude: 0.01, delay: 0.3 };
      client.last('run:kick').ack({ status: 'ok', data: { runId: 'r1', term } });
      await settle();
      // A live run may still take kicks: keeping waits for its end.
      expect(page.querySelector('[data-test=keep-kicks]')).toBeNull();
      client.receive('run:end', { runId: 'r1', reason: 'finished', message: 'horizon reached', simulatedTime: 2 });
      await settle();

      button('keep-kicks').click();
      await settle();
      expect(page.querySelector('[data-test=kick-list]')).toBeNull();
      expect(page.textContent).toContain('torque impulse 0.01 N·m·s at t = 0.3 s');
      expect(field('inputs.1.amplitude').value).toBe('0.01');
      expect(button('reset-edits').disabled).toBe(false);

      button('run').click();
      await fixture.whenStable();
      const sent = client.last('run:start').payload as { scenario?: { inputs: unknown[] } };
      expect(sent.scenario?.inputs).toEqual([...detail.scenario.inputs, term]);
      await finishRun('r2');

      button('reset-edits').click();
      await settle();
      expect(page.querySelector('input[name="inputs.1.amplitude"]')).toBeNull();
    });

    it('offers a reference step only in closed loop and shows refused and unreadable kicks', async () => {
      await startLive();
      expect(kickButton('kick-reference-step')).not.toBeNull();
      await type('kick.amplitude', 'lots');
      kickButton('kick-torque-step')!.click();
      await fixture.whenStable();
      expect(text('[data-test=kick-errors]')).toContain('amplitude must be a finite number, got "lots"');
      expect(client.emitted.filter((e) => e.event === 'run:kick')).toEqual([]);

      await type('kick.amplitude', '1e9');
      kickButton('kick-reference-step')!.click();
      client.last('run:kick').ack({ status: 'error', errors: [{ field: 'kick.amplitude', message: 'amplitude is out of range' }] });
      await settle();
      expect(text('[data-test=kick-errors]')?.replace(/\s+/g, ' ')).toContain('kick.amplitude: amplitude is out of range');
      expect(page.querySelector('[data-test=kick-list]')).toBeNull();
    });

    it('scrubs a paused run through the server and a finished one from its own samples', async () => {
      await startLive();
      const velocity = t.map((x) => 2 * x);
      client.receive('run:frame', frame('r1', t, t.map((x) => x * x), { velocity, appliedTorque: t.map(() => 0.7), saturating: t.map((x) => (x > 0.55 ? 1 : 0)) }));
      await fixture.whenStable();
      expect(page.querySelector('[data-test=saturating]')).not.toBeNull();
      expect(page.querySelector('[data-test=sticking]')).toBeNull();
      expect(scrubInput()).toBeNull();

      button('pause').click();
      client.last('run:pause').ack(control('paused', 0.6));
      await settle();
      await scrubTo(0.5);
      expect(client.last('run:scrub').payload).toEqual({ runId: 'r1', time: 0.5 });
      const sample: RunSample = { t: 0.5, angle: 0.25, velocity: 1, controllerTorque: 0.7, appliedTorque: 0.7, saturating: false, sticking: true };
      client.last('run:scrub').ack({ status: 'ok', data: sample });
      await settle();
      const readings = readout();
      expect(readings).toContain('t 0.5 s');
      expect(readings).toContain('angle 0.25 rad');
      expect(readings).toContain('velocity 1 rad/s');
      expect(readings).toContain('applied torque 0.7 N·m');
      expect(readings).toContain('sticking yes');
      expect(text('[data-test=run-status]')).toBe('paused t = 0.60 s');

      button('resume').click();
      client.last('run:resume').ack(control('running', 0.6));
      await settle();
      expect(page.querySelector('[data-test=scrub-readout]')).toBeNull();
      client.receive('run:end', { runId: 'r1', reason: 'stopped', message: 'stopped by the user', simulatedTime: 0.6 });
      await settle();

      const asked = client.emitted.filter((e) => e.event === 'run:scrub').length;
      await scrubTo(0.301);
      // The run is over: the bench reads its own samples (every 2 ms here) and asks nobody.
      expect(client.emitted.filter((e) => e.event === 'run:scrub')).toHaveLength(asked);
      const after = readout();
      expect(after).toContain('t 0.3 s');
      expect(after).toContain('angle 0.09 rad');
      expect(after).toContain('velocity 0.6 rad/s');
      expect(after).toContain('saturating no');
    });
  });
});
