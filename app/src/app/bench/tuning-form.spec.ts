import { type ComponentFixture, TestBed } from '@angular/core/testing';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import { applyFieldEdits } from '@kinetwin/shared/scenario/field-edits';
import { type FieldEdit, TuningForm } from './tuning-form';

// Invented demo values.
const saved: Scenario = {
  kind: 'kinetwin/scenario',
  version: 1,
  name: 'Demo elbow',
  notes: '',
  joint: { inertia: 0.02, damping: 0.015, stiffness: 1.8, gearRatio: 1 },
  controller: { mode: 'pid', kp: 1, ki: 0, kd: 0.05, derivativeOn: 'error', derivativeFilter: 0, samplePeriod: null },
  initial: { angle: 0.3, velocity: 0 },
  inputs: [
    { channel: 'reference', shape: 'step', amplitude: 0.2, delay: 0 },
    { channel: 'torque', shape: 'pulse', amplitude: 0.25, delay: 1, width: 0.2 },
    { channel: 'torque', shape: 'sine', amplitude: 0.1, delay: 0, frequency: 3 },
  ],
  horizon: 4,
  limits: { overshootPercent: null, settlingTime: null, steadyStateError: null },
  nonlinear: {},
};

describe('TuningForm', () => {
  let fixture: ComponentFixture<TuningForm>;
  let page: HTMLElement;
  let edits: FieldEdit[];
  let resets: number;

  const field = (name: string) => page.querySelector<HTMLInputElement>(`[name="${name}"]`);
  const errorUnder = (name: string) => page.querySelector(`[data-test="field-error-${name}"]`)?.textContent?.trim() ?? null;

  /** Shows the form as the bench would for these edits: validated by the shared schema. */
  async function showEdits(current: Record<string, string>): Promise<void> {
    const edited = applyFieldEdits(saved, current);
    fixture.componentRef.setInput('edits', current);
    fixture.componentRef.setInput('errors', edited.ok ? [] : edited.errors);
    await fixture.whenStable();
  }

  beforeEach(async () => {
    fixture = TestBed.createComponent(TuningForm);
    page = fixture.nativeElement;
    edits = [];
    resets = 0;
    fixture.componentInstance.edited.subscribe((edit) => edits.push(edit));
    fixture.componentInstance.resetToSaved.subscribe(() => resets++);
    fixture.componentRef.setInput('saved', saved);
    await showEdits({});
  });

  it('has a field per editable quantity, named by its scenario path and showing the saved value', () => {
    for (const name of ['joint.inertia', 'joint.damping', 'joint.stiffness', 'joint.gearRatio', 'controller.kp', 'controller.ki', 'controller.kd', 'controller.derivativeFilter', 'initial.angle', 'initial.velocity', 'horizon']) {
      expect(field(name), name).not.toBeNull();
    }
    expect(field('joint.inertia')!.value).toBe('0.02');
    expect(field('controller.mode')!.value).toBe('pid');
    expect(field('controller.derivativeOn')!.value).toBe('error');
    // Each term's amplitude and delay, plus the quantity its shape has, and nothing it has not.
    expect(field('inputs.0.amplitude')!.value).toBe('0.2');
    expect(field('inputs.0.width')).toBeNull();
    expect(field('inputs.1.width')!.value).toBe('0.2');
    expect(field('inputs.2.frequency')!.value).toBe('3');
    expect(field('inputs.2.rate')).toBeNull();
  });

  it('reports typing and choices as edits of the dotted path', () => {
    const kp = field('controller.kp')!;
    kp.value = '2.5';
    kp.dispatchEvent(new Event('input'));
    const mode = page.querySelector<HTMLSelectElement>('select[name="controller.mode"]')!;
    mode.value = 'open-loop';
    mode.dispatchEvent(new Event('change'));
    expect(edits).toEqual([
      { path: 'controller.kp', text: '2.5' },
      { path: 'controller.mode', text: 'open-loop' },
    ]);
  });

  it("shows each field's error under it and errors about no field above the form", async () => {
    await showEdits({ 'joint.inertia': '-1', 'controller.kd': 'fast', 'inputs.1.width': '0' });
    expect(field('joint.inertia')!.value).toBe('-1');
    expect(errorUnder('joint.inertia')).toBe('inertia must be positive');
    expect(errorUnder('controller.kd')).toBe('kd must be a finite number, got "fast"');
    expect(errorUnder('inputs.1.width')).toBe('width must be positive');
    expect(field('joint.inertia')!.getAttribute('aria-invalid')).toBe('true');
    expect(errorUnder('controller.kp')).toBeNull();
    // Open loop with a reference term: the error names inputs.0.channel, which has no field here.
    await showEdits({ 'controller.mode': 'open-loop' });
    expect(page.querySelector('[data-test=tuning-errors]')?.textContent).toContain('a reference input needs a closed loop');
  });

  it('offers no gains while the mode is open loop, and brings them back with the PID loop', async () => {
    await showEdits({ 'controller.mode': 'open-loop' });
    for (const name of ['controller.kp', 'controller.ki', 'controller.kd', 'controller.derivativeFilter', 'controller.derivativeOn']) expect(field(name), name).toBeNull();
    expect(field('controller.mode')).not.toBeNull();
    expect(field('joint.inertia')).not.toBeNull();
    await showEdits({ 'controller.mode': 'pid' });
    expect(field('controller.kp')).not.toBeNull();
  });

  it('offers Reset to saved only while there are edits', async () => {
    const reset = page.querySelector<HTMLButtonElement>('[data-test=reset-edits]')!;
    expect(reset.disabled).toBe(true);
    await showEdits({ 'controller.kp': '3' });
    expect(reset.disabled).toBe(false);
    reset.click();
    expect(resets).toBe(1);
  });

  it('shows the twin effects in words with units, empty for none, and reports a typed effect as an edit', async () => {
    const legend = [...page.querySelectorAll('legend')].map((l) => l.textContent?.trim());
    expect(legend).toContain('Twin effects');
    const limit = field('nonlinear.torqueLimit')!;
    expect(limit.value).toBe('');
    expect(limit.closest('.field')?.textContent).toContain('Torque limit');
    expect(limit.closest('.field')?.textContent).toContain('N·m');
    // No gravity load in this scenario: its fields wait until it has one.
    expect(field('nonlinear.gravity.arm')).toBeNull();
    limit.value = '2';
    limit.dispatchEvent(new Event('input'));
    expect(edits).toEqual([{ path: 'nonlinear.torqueLimit', text: '2' }]);
  });
});
