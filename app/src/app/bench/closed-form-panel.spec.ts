import { type ComponentFixture, TestBed } from '@angular/core/testing';
import * as engine from '@kinetwin/shared/closed-form/index';
import { parseScenario } from '@kinetwin/shared/scenario/parse-scenario';
import type { ScenarioInput } from '@kinetwin/shared/scenario/scenario-schema';
import { ClosedFormPanel } from './closed-form-panel';
import { type ClosedFormView, closedFormView } from './closed-form-view';
import { formatQuantity } from './scenario-facts';

// Invented demo values, chosen for round textbook numbers: J θ'' + (b + N·kd) θ' + N·kp θ = N·kp r with
// derivative on measurement gives ωn = √(N·kp/J) = 20 rad/s and ζ = (b + N·kd)/(2·J·ωn) = 0.2, no zero.
const pidStep: ScenarioInput = {
  kind: 'kinetwin/scenario',
  version: 1,
  name: 'Demo PD step',
  joint: { inertia: 0.01, damping: 0.05, stiffness: 0, gearRatio: 1 },
  controller: { mode: 'pid', kp: 4, ki: 0, kd: 0.03, derivativeOn: 'measurement', derivativeFilter: 0 },
  inputs: [{ channel: 'reference', shape: 'step', amplitude: 0.5, delay: 0 }],
  horizon: 2,
  limits: { overshootPercent: 10, settlingTime: 2, steadyStateError: 0.001 },
};

/** A free inertia (no spring, no damper, no loop) pushed by a torque step: θ grows like t². */
const freeInertia: ScenarioInput = {
  kind: 'kinetwin/scenario',
  version: 1,
  name: 'Demo free inertia',
  joint: { inertia: 0.01, damping: 0, stiffness: 0, gearRatio: 1 },
  controller: { mode: 'open-loop' },
  inputs: [{ channel: 'torque', shape: 'step', amplitude: 0.1, delay: 0 }],
  horizon: 1,
};

function viewOf(input: unknown): ClosedFormView {
  return closedFormView(engine, parseScenario(input));
}

describe('ClosedFormPanel', () => {
  let fixture: ComponentFixture<ClosedFormPanel>;
  let page: HTMLElement;
  const text = (selector: string) => page.querySelector(selector)?.textContent?.replace(/\s+/g, ' ').trim() ?? null;
  /** The initial-value table as rows of cell texts: [quantity, at 0−, at 0+]. */
  const initialRows = () =>
    [...page.querySelectorAll('[data-test=initial-value] tr')].slice(1).map((row) => [...row.children].map((cell) => cell.textContent?.trim()));

  async function show(view: ClosedFormView): Promise<void> {
    fixture.componentRef.setInput('view', view);
    await fixture.whenStable();
  }

  beforeEach(() => {
    fixture = TestBed.createComponent(ClosedFormPanel);
    page = fixture.nativeElement;
  });

  it('shows the final value, poles, metrics against limits and the dominant pair of a stable PID step', async () => {
    const view = viewOf(pidStep);
    expect(view.kind).toBe('solved');
    await show(view);

    // Unity DC gain from reference to angle: the 0.5 rad step settles at 0.5 rad (final value theorem).
    expect(text('[data-test=final-value]')).toBe('0.5 rad');
    expect(text('[data-test=poles]')).toContain('-4 ± 19.6j rad/s');
    expect(text('[data-test=poles]')).toContain('stable');

    // Overshoot 100·exp(−ζπ/√(1−ζ²)) and peak time π/ωd of a second-order loop without zeros
    // (Ogata, Modern Control Engineering, ch. 5, from memory).
    const zeta = 0.2;
    const wd = 20 * Math.sqrt(1 - zeta * zeta);
    const overshoot = 100 * Math.exp((-zeta * Math.PI) / Math.sqrt(1 - zeta * zeta));
    expect(text('[data-test=metric-overshootPercent]')).toContain(formatQuantity(overshoot, '%'));
    expect(text('[data-test=metric-overshootPercent]')).toContain('≤ 10 %');
    expect(text('[data-test=metric-overshootPercent]')).toContain('not met');
    expect(text('[data-test=metric-peakTime]')).toContain(formatQuantity(Math.PI / wd, 's'));
    expect(text('[data-test=metric-settlingTime]')).toContain('✓ met');
    // Zero error for a type 1 loop, up to the engine's roundoff.
    const error = Number(page.querySelector('[data-test=metric-steadyStateError] td')?.textContent?.replace(' rad', ''));
    expect(Math.abs(error)).toBeLessThan(1e-12);
    expect(text('[data-test=metric-steadyStateError]')).toContain('✓ met');
    expect(text('[data-test=metric-riseTime]')).toContain('none');
    expect(text('[data-test=dominant-pair]')).toContain('ζ = 0.2, ωn = 20 rad/s');

    // θ(0+) = θ(0−) with no jump: derivative on measurement gives no kick.
    expect(initialRows()).toEqual([
      ['θ', '0 rad', '0 rad'],
      ["θ'", '0 rad/s', '0 rad/s'],
    ]);

    // KaTeX arrives by a dynamic import; its output lands inside the latex element.
    for (let i = 0; i < 100 && !page.querySelector('[data-test=closed-form-latex] .katex'); i++) await new Promise((resolve) => setTimeout(resolve, 20));
    expect(page.querySelector('[data-test=closed-form-latex] .katex')).not.toBeNull();
    expect(page.querySelector('[data-test=closed-form-latex] .katex-error')).toBeNull();
  });

  it('gives the reason instead of a final value for a free inertia driven by a torque step', async () => {
    await show(viewOf(freeInertia));
    const finalValue = text('[data-test=final-value]')!;
    expect(finalValue).toMatch(/^Does not apply: /);
    expect(finalValue).toContain('double integrator');
    expect(text('[data-test=poles]')).toContain('0 rad/s (×2)');
    expect(text('[data-test=metrics]')).toContain('no reference step');
    expect(page.querySelector('[data-test=dominant-pair]')).toBeNull();
  });

  it('shows the jump of a derivative kick between 0− and 0+', async () => {
    // Derivative on the error, unfiltered: Δθ' = N·kd·A/J = 2 · 0.1 · 0.5 / 0.01 = 10 rad/s (the model in the team rules).
    const kicked = { ...pidStep, joint: { ...pidStep.joint, gearRatio: 2 }, controller: { mode: 'pid', kp: 4, kd: 0.1, derivativeOn: 'error' } };
    await show(viewOf(kicked));
    expect(initialRows()).toEqual([
      ['θ', '0 rad', '0 rad'],
      ["θ'", '0 rad/s', '10 rad/s'],
    ]);
  });

  it('typesets a response of several shifted pieces, one per line, without KaTeX errors', async () => {
    await show(viewOf({ ...pidStep, inputs: [...pidStep.inputs!, { channel: 'torque', shape: 'pulse', amplitude: 0.2, delay: 0.5, width: 0.1 }] }));
    for (let i = 0; i < 100 && !page.querySelector('[data-test=closed-form-latex] .katex'); i++) await new Promise((resolve) => setTimeout(resolve, 20));
    const latex = page.querySelector('[data-test=closed-form-latex]')!;
    expect(latex.querySelector('.katex')).not.toBeNull();
    expect(latex.querySelector('.katex-error')).toBeNull();
    // KaTeX keeps the source it typeset in its MathML annotation: the stacked form, with the pieces on their own lines.
    const source = latex.querySelector('annotation')?.textContent ?? '';
    expect(source).toMatch(/^\\begin\{aligned\}/);
    expect(source.match(/\\\\ &\\quad/g)?.length).toBe(2);
  });

  it('lists the field errors of an invalid scenario without crashing, then recovers', async () => {
    await show(viewOf({ ...pidStep, joint: { ...pidStep.joint, inertia: -1 } }));
    expect(text('[data-test=closed-form-errors]')).toContain('joint.inertia: inertia must be positive');
    expect(page.querySelector('[data-test=final-value]')).toBeNull();

    await show(viewOf({ ...pidStep, horizon: Number.NaN }));
    expect(text('[data-test=closed-form-errors]')).toContain('horizon');

    await show(viewOf(pidStep));
    expect(page.querySelector('[data-test=closed-form-errors]')).toBeNull();
    expect(text('[data-test=final-value]')).toBe('0.5 rad');
  });

  it('says so when the engine has not loaded or failed', async () => {
    await show(closedFormView(null, parseScenario(pidStep)));
    expect(page.textContent).toContain('Loading the closed-form engine');
    await show({ kind: 'failed', message: 'The closed form could not be computed: boom' });
    expect(text('[data-test=closed-form-failure]')).toBe('The closed form could not be computed: boom');
  });
});

describe('ClosedFormPanel notes', () => {
  it("lists the engine's notes and the nonlinear effects the closed form leaves out", async () => {
    const fixture = TestBed.createComponent(ClosedFormPanel);
    const sampled = { ...pidStep, controller: { ...pidStep.controller, samplePeriod: 0.001 }, nonlinear: { torqueLimit: 2, coulombFriction: 0, antiWindup: true } };
    fixture.componentRef.setInput('view', viewOf(sampled));
    await fixture.whenStable();
    const notes = (fixture.nativeElement as HTMLElement).querySelector('[data-test=closed-form-notes]')?.textContent ?? '';
    expect(notes).toContain('samplePeriod');
    expect(notes).toContain('The twin adds torqueLimit;');
    expect(notes).not.toContain('coulombFriction');
    expect(notes).not.toContain('antiWindup');
  });
});
