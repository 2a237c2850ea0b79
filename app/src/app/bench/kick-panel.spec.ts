import { TestBed } from '@angular/core/testing';
import type { KickRequest } from './kick-panel';
import { KickPanel } from './kick-panel';

describe('KickPanel', () => {
  async function panel(closedLoop: boolean) {
    const fixture = TestBed.createComponent(KickPanel);
    fixture.componentRef.setInput('enabled', true);
    fixture.componentRef.setInput('closedLoop', closedLoop);
    fixture.componentRef.setInput('kicks', []);
    const asked: KickRequest[] = [];
    fixture.componentInstance.kicked.subscribe((kick) => asked.push(kick));
    await fixture.whenStable();
    return { fixture, page: fixture.nativeElement as HTMLElement, asked };
  }

  it('offers a reference step only in closed loop', async () => {
    expect((await panel(true)).page.querySelector('[data-test=kick-reference-step]')).not.toBeNull();
    expect((await panel(false)).page.querySelector('[data-test=kick-reference-step]')).toBeNull();
  });

  it('asks for a kick of the typed amplitude and refuses empty text', async () => {
    const { fixture, page, asked } = await panel(false);
    const amplitude = page.querySelector<HTMLInputElement>('input[name="kick.amplitude"]')!;
    amplitude.value = '-0.5';
    amplitude.dispatchEvent(new Event('input'));
    page.querySelector<HTMLButtonElement>('[data-test=kick-torque-step]')!.click();
    expect(asked).toEqual([{ channel: 'torque', shape: 'step', amplitude: -0.5 }]);

    amplitude.value = '  ';
    amplitude.dispatchEvent(new Event('input'));
    page.querySelector<HTMLButtonElement>('[data-test=kick-torque-impulse]')!.click();
    await fixture.whenStable();
    expect(asked).toHaveLength(1);
    expect(page.querySelector('[data-test=kick-errors]')?.textContent).toContain('amplitude is required');
  });

  it('takes the amplitude before a run is live, with the kick buttons off until then', async () => {
    const { fixture, page } = await panel(true);
    fixture.componentRef.setInput('enabled', false);
    await fixture.whenStable();
    const amplitude = page.querySelector<HTMLInputElement>('input[name="kick.amplitude"]')!;
    expect(amplitude.disabled).toBe(false);
    amplitude.value = '0.05';
    amplitude.dispatchEvent(new Event('input'));
    expect(page.querySelector<HTMLButtonElement>('[data-test=kick-torque-impulse]')!.disabled).toBe(true);
    fixture.componentRef.setInput('enabled', true);
    await fixture.whenStable();
    expect(amplitude.value).toBe('0.05');
  });
});
