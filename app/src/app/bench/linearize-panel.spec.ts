import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { signal } from '@angular/core';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { linearizeAbout } from '@kinetwin/shared/linearize/operating-point';
import type { SessionUser } from '@kinetwin/shared/protocol/api-types';
import type { OperatingRangeResponse } from '@kinetwin/shared/protocol/check-api';
import { SAFETY_CAUTION } from '@kinetwin/shared/protocol/library-api';
import { parseScenario } from '@kinetwin/shared/scenario/parse-scenario';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import type { Parsed } from '@kinetwin/shared/validation/field-errors';
import { Session } from '../core/session';
import { LinearizePanel } from './linearize-panel';

// Demo data (invented numbers): a 1.2 kg link with its centre of mass 0.25 m out, on a PID loop.
function arm(gravity = true, kp = 20): Parsed<Scenario> {
  return parseScenario({
    kind: 'kinetwin/scenario',
    version: 1,
    name: 'Demo pendulum arm',
    joint: { inertia: 0.09, damping: 0.2, stiffness: 0.5 },
    controller: { mode: 'pid', kp, ki: 2, kd: 1.5, derivativeOn: 'measurement' },
    inputs: [{ channel: 'reference', shape: 'step', amplitude: 0.1, delay: 0.1 }],
    horizon: 3,
    nonlinear: gravity ? { gravity: { mass: 1.2, arm: 0.25 } } : {},
  });
}
const mgl = 1.2 * 9.80665 * 0.25;
const sig = (x: number) => String(Number(x.toPrecision(4)));

describe('LinearizePanel', () => {
  let fixture: ComponentFixture<LinearizePanel>;
  let root: HTMLElement;
  let http: HttpTestingController;
  const user = signal<SessionUser | null>({ id: 7, email: 'eng@example.test', displayName: 'Eng', role: 'engineer' });
  const text = (selector: string) => root.querySelector(selector)?.textContent?.replace(/\s+/g, ' ').trim() ?? null;
  const field = (name: string) => root.querySelector<HTMLInputElement | HTMLSelectElement>(`[name="${name}"]`)!;
  const button = (test: string) => root.querySelector<HTMLButtonElement>(`[data-test=${test}]`);

  async function settle(): Promise<void> {
    await new Promise((resolve) => setTimeout(resolve));
    await fixture.whenStable();
  }
  async function type(name: string, value: string): Promise<void> {
    const element = field(name);
    element.value = value;
    element.dispatchEvent(new Event(element instanceof HTMLSelectElement ? 'change' : 'input'));
    await settle();
  }
  async function show(draft: Parsed<Scenario> | null): Promise<void> {
    fixture.componentRef.setInput('draft', draft);
    await settle();
  }

  beforeEach(() => {
    user.set({ id: 7, email: 'eng@example.test', displayName: 'Eng', role: 'engineer' });
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting(), provideRouter([]), { provide: Session, useValue: { user } }] });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(LinearizePanel);
    fixture.componentRef.setInput('tags', ['arm']);
    root = fixture.nativeElement;
  });
  afterEach(() => http.verify());

  it('stays hidden for a joint without gravity', async () => {
    await show(arm(false));
    expect(root.classList).toContain('absent');
    expect(root.querySelector('h2')).toBeNull();
  });

  it('shows k + m·g·l·cos θ0 and the holding torque at once, and follows the unit and the holding', async () => {
    await show(arm());
    expect(root.classList).not.toContain('absent');
    expect(text('[data-test=effective-stiffness]')).toBe(`${sig(0.5 + mgl)} N·m/rad`);
    await type('linearize-angle', '60');
    expect(text('[data-test=effective-stiffness]')).toBe(`${sig(0.5 + mgl * Math.cos(Math.PI / 3))} N·m/rad`);
    expect(text('[data-test=holding-torque]')).toBe(`${sig(0.5 * (Math.PI / 3) + mgl * Math.sin(Math.PI / 3))} N·m`);
    await type('linearize-unit', 'rad');
    await type('linearize-angle', '1');
    expect(text('[data-test=effective-stiffness]')).toBe(`${sig(0.5 + mgl * Math.cos(1))} N·m/rad`);
    await type('linearize-holding', 'disturbance');
    expect(text('[data-test=linearize-notes]')).toContain('left to the loop');
    expect(root.querySelector('[data-test=linearize-caution]')).toBeNull();
    // Straight up: the link tips away by itself.
    await type('linearize-unit', 'deg');
    await type('linearize-angle', '180');
    expect(text('[data-test=linearize-caution]')).toContain('unstable plant');
  });

  it('refuses a bad field inline and runs nothing', async () => {
    await show(arm());
    await type('linearize-angle', 'up');
    expect(text('[data-test=linearize-error-angle]')).toBe('must be a number, got "up"');
    expect(root.querySelector('[data-test=effective-stiffness]')).toBeNull();
    expect(button('find-range')!.disabled).toBe(true);
    expect(button('save-linear')!.disabled).toBe(true);
  });

  it('asks the server how far the model holds, shows the range, and marks it stale when the operating point changes', async () => {
    await show(arm());
    await type('linearize-angle', '60');
    await type('linearize-tolerance', '2');
    button('find-range')!.click();
    await settle();
    expect(root.querySelector('[data-test=range-running]')).not.toBeNull();
    const request = http.expectOne('/api/checks/operating-range');
    const draft = arm();
    expect(request.request.body).toEqual({ scenario: draft.ok && draft.value, angle: Math.PI / 3, holding: 'feed-forward', tolerance: 0.02 });
    const answer: OperatingRangeResponse = {
      linear: {},
      effectiveStiffness: 0.5 + mgl / 2,
      holdingTorque: 3,
      notes: [],
      range: { tolerance: 0.02, scale: 3.2, smallestScale: null, largestMove: 0.33, checks: 15, summary: 'the twin and the linear model agree within 2 % up to scale 3.2' },
      elapsedMs: 900,
    };
    request.flush(answer);
    await settle();
    expect(root.querySelector('[data-test=range-running]')).toBeNull();
    expect(text('[data-test=range-headline]')).toBe("The linear model holds within 2 % of the peak for moves up to 0.33 rad (18.91°) from θ0: ×3.2 of the scenario's moves.");
    expect(text('[data-test=range-summary]')).toBe(answer.range!.summary);
    expect(root.querySelector('[data-test=range-stale]')).toBeNull();
    await type('linearize-angle', '45');
    expect(root.querySelector('[data-test=range-stale]')).not.toBeNull();
    await type('linearize-angle', '60');
    expect(root.querySelector('[data-test=range-stale]')).toBeNull();
    await show(arm(true, 25));
    expect(root.querySelector('[data-test=range-stale]')).not.toBeNull();
  });

  it('shows the refusal of the range with its field errors', async () => {
    await show(arm());
    button('find-range')!.click();
    await settle();
    http
      .expectOne('/api/checks/operating-range')
      .flush({ error: { code: 'bad_request', message: 'The joint cannot be linearized there; nothing was run.', fields: [{ field: 'inputs', message: 'the scenario has no inputs' }] } }, { status: 400, statusText: 'Bad Request' });
    await settle();
    expect(text('[data-test=range-error] p')).toBe('The joint cannot be linearized there; nothing was run.');
    expect(text('[data-test=range-error] li')).toBe('inputs: the scenario has no inputs');
  });

  it('saves the linear model as a new library scenario with the safety caution, and offers no save to a viewer', async () => {
    await show(arm());
    await type('linearize-angle', '60');
    button('save-linear')!.click();
    await settle();
    const request = http.expectOne('/api/scenarios');
    expect(request.request.method).toBe('POST');
    const draft = arm();
    if (!draft.ok) throw new Error('fixture invalid');
    const want = linearizeAbout(draft.value, { angle: Math.PI / 3, holding: 'feed-forward' });
    if (!want.ok) throw new Error('refused');
    expect(request.request.body).toEqual({ scenario: want.value.linear, note: 'Linear model about θ0 = 60° (holding torque: feed-forward), made on the bench', tags: ['arm'] });
    expect(want.value.linear.joint.stiffness).toBeCloseTo(0.5 + mgl / 2, 12);
    expect(want.value.linear.nonlinear.gravity).toBeUndefined();
    request.flush({ id: 42, name: want.value.linear.name });
    await settle();
    expect(text('[data-test=linear-saved]')).toContain(`Saved “${want.value.linear.name}” to the library as a new scenario.`);
    expect(root.querySelector('[data-test=open-linear]')!.getAttribute('href')).toBe('/bench/42');
    expect(text('[data-test=safety-caution]')).toContain(SAFETY_CAUTION);

    user.set({ id: 8, email: 'view@example.test', displayName: 'View', role: 'viewer' });
    await settle();
    expect(button('save-linear')).toBeNull();
  });

  it('keeps the last valid model, dimmed, while the draft has errors', async () => {
    await show(arm());
    await show({ ok: false, errors: [{ field: 'joint.inertia', message: 'inertia must be positive' }] });
    expect(root.classList).not.toContain('absent');
    expect(text('[data-test=linearize-blocked]')).toContain('The edited scenario has errors');
    expect(text('[data-test=effective-stiffness]')).toBe(`${sig(0.5 + mgl)} N·m/rad`);
    expect(button('find-range')!.disabled).toBe(true);
  });
});
