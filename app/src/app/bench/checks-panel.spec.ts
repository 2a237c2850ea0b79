import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import type { CheckResponse } from '@kinetwin/shared/protocol/check-api';
import { parseScenario } from '@kinetwin/shared/scenario/parse-scenario';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import type { Parsed } from '@kinetwin/shared/validation/field-errors';
import { ChecksPanel } from './checks-panel';

// Demo data (invented numbers).
function scenario(kp: number, torqueLimit?: number): Scenario {
  const parsed = parseScenario({
    kind: 'kinetwin/scenario',
    version: 1,
    name: 'Wrist pitch',
    joint: { inertia: 0.012, damping: 0.04, stiffness: 0 },
    controller: { mode: 'pid', kp, ki: 1, kd: 0.4, derivativeOn: 'measurement' },
    inputs: [{ channel: 'reference', shape: 'step', amplitude: 0.5, delay: 0.1 }],
    horizon: 2,
    nonlinear: torqueLimit === undefined ? {} : { torqueLimit },
  });
  if (!parsed.ok) throw new Error('fixture invalid');
  return parsed.value;
}

// Shaped like the server's answer for the wrist demo (figures from a run of the checks, rounded).
const passing: CheckResponse = {
  superposition: { pass: true, worst: 1.88e-10, threshold: 1e-4, worstTime: 0.45, reason: 'superposition holds: worst deviation 1.88e-10 of the peak (threshold 1.00e-4)' },
  shift: { pass: true, worst: 1.43e-10, threshold: 1e-4, worstTime: 0.9, reason: 'time invariance holds for a shift of 0.5 s: worst deviation 1.43e-10 of the peak' },
  linearRange: { scale: 1000, smallestScale: null, passesAtMax: true, summary: 'superposition holds at every end of the range tried, 0.001 to 1000', triedScales: [0.001, 1000] },
  twinVsClosedForm: { available: true, rms: 2.65e-11, max: 9.58e-11, timeOfMax: 1.603, relativeMax: 1.9e-10, twinStop: null },
  elapsedMs: 52.4,
};

// Shaped like the server's answer for the wrist demo behind a 1 N·m limit.
const limited: CheckResponse = {
  superposition: {
    pass: false,
    worst: 0.2346,
    threshold: 1e-4,
    worstTime: 0.202,
    reason: 'torque limit ±1 N·m reached at t = 0.100 s in the u1 run; y(2·u1) departs from 2·y1 by 2.35e-1 of the peak at t = 0.202 s (threshold 1.00e-4)',
  },
  shift: { pass: true, worst: 1e-10, threshold: 1e-4, worstTime: 0.9, reason: 'time invariance holds for a shift of 0.5 s: worst deviation 1.00e-10 of the peak' },
  linearRange: {
    scale: 0.1696,
    smallestScale: null,
    passesAtMax: false,
    summary: 'superposition holds up to input scale 0.17 (fails at 0.171: torque limit ±1 N·m reached at t = 0.100 s in the 2·u1 run)',
    triedScales: [0.001, 1000],
  },
  twinVsClosedForm: { available: true, rms: 0.01575, max: 0.0773, timeOfMax: 0.167, relativeMax: 0.15, twinStop: null },
  elapsedMs: 263,
};

describe('ChecksPanel', () => {
  let fixture: ComponentFixture<ChecksPanel>;
  let http: HttpTestingController;
  let root: HTMLElement;

  async function settle(): Promise<void> {
    await new Promise((resolve) => setTimeout(resolve));
    await fixture.whenStable();
  }

  async function showDraft(draft: Parsed<Scenario> | null): Promise<void> {
    fixture.componentRef.setInput('draft', draft);
    await settle();
  }

  const text = (selector: string) => root.querySelector(selector)?.textContent?.replace(/\s+/g, ' ').trim() ?? null;
  const runButton = () => root.querySelector<HTMLButtonElement>('[data-test=run-checks]')!;

  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ChecksPanel);
    root = fixture.nativeElement;
  });

  afterEach(() => http.verify());

  it('sends the draft, shows progress, then the verdicts, the linear range and the residual', async () => {
    const draft = scenario(6);
    await showDraft({ ok: true, value: draft });
    expect(runButton().disabled).toBe(false);
    runButton().click();
    await settle();

    const request = http.expectOne('/api/checks');
    expect(request.request.method).toBe('POST');
    expect(request.request.body).toEqual({ scenario: draft });
    expect(root.querySelector('[data-test=checks-running] mat-progress-bar')).not.toBeNull();
    expect(runButton().disabled).toBe(true);

    request.flush(passing);
    await settle();
    expect(root.querySelector('[data-test=checks-running]')).toBeNull();
    expect(text('[data-test=check-superposition] [data-test=verdict]')).toBe('passes');
    expect(text('[data-test=check-superposition]')).toContain('worst deviation 1.9e-8 % of the peak angle; passes up to 0.01 %');
    expect(text('[data-test=check-shift] [data-test=verdict]')).toBe('passes');
    expect(text('[data-test=check-shift] [data-test=reason]')).toBe(passing.shift.reason);
    expect(text('[data-test=linear-range]')).toBe('The closed form holds up to at least ×1000 of this input (the largest scale tried), and down to ×0.001.');
    expect(text('[data-test=residual-figures]')).toBe('RMS 2.65e-11 rad, max 9.58e-11 rad at t = 1.603 s.');
    expect(text('[data-test=checks-elapsed]')).toBe('Checked in 0.0524 s on the server.');
    expect(root.querySelector('[data-test=checks-stale]')).toBeNull();
    expect(runButton().disabled).toBe(false);
  });

  it('shows a failed superposition check with the reason naming the torque limit', async () => {
    await showDraft({ ok: true, value: scenario(6, 1) });
    runButton().click();
    http.expectOne('/api/checks').flush(limited);
    await settle();
    expect(root.querySelector('[data-test=check-superposition]')?.classList).toContain('fail');
    expect(text('[data-test=check-superposition] [data-test=verdict]')).toBe('fails');
    expect(text('[data-test=check-superposition] [data-test=reason]')).toMatch(/^torque limit ±1 N·m reached at t = 0.100 s/);
    expect(text('[data-test=check-superposition]')).toContain('worst deviation 23.5 % of the peak angle');
    expect(text('[data-test=linear-range]')).toBe('The closed form holds up to ×0.17 of this input. This input (×1) is past it: expect the twin to depart from the closed form.');
  });

  it('marks the results stale when the draft changes, and fresh again when it changes back', async () => {
    await showDraft({ ok: true, value: scenario(6) });
    runButton().click();
    http.expectOne('/api/checks').flush(passing);
    await settle();
    expect(root.querySelector('[data-test=checks-stale]')).toBeNull();

    await showDraft({ ok: true, value: scenario(8) });
    expect(text('[data-test=checks-stale]')).toContain('The draft changed since these results');
    expect(root.querySelector('.results')?.classList).toContain('is-stale');
    // The old results stay readable while stale.
    expect(text('[data-test=check-superposition] [data-test=verdict]')).toBe('passes');

    // Same quantities, another object (the bench parses the draft again on every edit).
    await showDraft({ ok: true, value: scenario(6) });
    expect(root.querySelector('[data-test=checks-stale]')).toBeNull();
  });

  it("shows the API's message and field errors when the checks fail", async () => {
    await showDraft({ ok: true, value: scenario(6) });
    runButton().click();
    http.expectOne('/api/checks').flush(
      {
        error: {
          code: 'checks_timeout',
          message: 'The checks did not finish within 60 s (waiting for a free worker included) and were stopped.',
        },
      },
      { status: 504, statusText: 'Gateway Timeout' },
    );
    await settle();
    expect(text('[data-test=checks-error]')).toBe('The checks did not finish within 60 s (waiting for a free worker included) and were stopped.');
    expect(root.querySelector('[data-test=check-superposition]')).toBeNull();

    runButton().click();
    http.expectOne('/api/checks').flush(
      { error: { code: 'bad_request', message: 'The scenario cannot be checked; no checks were run.', fields: [{ field: 'scenario.joint.inertia', message: 'inertia must be positive' }] } },
      { status: 400, statusText: 'Bad Request' },
    );
    await settle();
    expect(text('[data-test=checks-error] p')).toBe('The scenario cannot be checked; no checks were run.');
    expect(text('[data-test=checks-error] li')).toBe('scenario.joint.inertia: inertia must be positive');
  });

  it('cannot run on an invalid draft or before the scenario loads', async () => {
    await showDraft(null);
    expect(runButton().disabled).toBe(true);
    await showDraft({ ok: false, errors: [{ field: 'joint.inertia', message: 'inertia must be positive' }] });
    expect(runButton().disabled).toBe(true);
    expect(text('.actions .note')).toBe('Fix the edited fields first: the checks run on a valid draft.');
    runButton().click();
    http.expectNone('/api/checks');
  });

  it('cancels the request when the bench is left', async () => {
    await showDraft({ ok: true, value: scenario(6) });
    runButton().click();
    const request = http.expectOne('/api/checks');
    fixture.destroy();
    expect(request.cancelled).toBe(true);
  });
});
