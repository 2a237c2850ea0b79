import { Component, input } from '@angular/core';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { type ComponentFixture, DeferBlockBehavior, TestBed } from '@angular/core/testing';
import { By } from '@angular/platform-browser';
import { provideRouter } from '@angular/router';
import type { ScenarioDetail } from '@kinetwin/shared/protocol/api-types';
import type { RunFrame } from '@kinetwin/shared/protocol/run-events';
import { RUN_SOCKET_FACTORY, type RunSocketClient } from '../core/run-socket-factory';
import { FakeRunSocketClient } from '../core/testing/fake-run-socket-client';
import { AngleChart } from './angle-chart';
import { Bench } from './bench';
import type { ChartFeed } from './chart-feed';
import { joinBatches } from './chart-feed';

/** Takes the chart's place: Plotly does not run under jsdom, and what the bench feeds it is the point. */
@Component({ selector: 'kt-angle-chart', template: '' })
class RecordingChart {
  readonly horizon = input.required<number>();
  readonly feed = input.required<ChartFeed>();
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

function frame(runId: string, t: number[], angle: number[]): RunFrame {
  const zeros = () => t.map(() => 0);
  return { runId, t, angle, velocity: zeros(), controllerTorque: zeros(), appliedTorque: zeros(), saturating: zeros(), sticking: zeros() };
}

describe('Bench', () => {
  let fixture: ComponentFixture<Bench>;
  let http: HttpTestingController;
  let client: FakeRunSocketClient;
  let page: HTMLElement;

  const text = (selector: string) => page.querySelector(selector)?.textContent?.trim() ?? null;
  const button = (name: string) => page.querySelector<HTMLButtonElement>(`[data-test=${name}]`)!;
  const chartFeed = () => fixture.debugElement.query(By.directive(RecordingChart)).componentInstance.feed() as ChartFeed;
  async function settle(): Promise<void> {
    await new Promise((resolve) => setTimeout(resolve));
    await fixture.whenStable();
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
    TestBed.overrideComponent(Bench, { remove: { imports: [AngleChart] }, add: { imports: [RecordingChart] } });
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
});
