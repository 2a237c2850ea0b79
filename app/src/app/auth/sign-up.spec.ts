import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { SignUp } from './sign-up';

describe('SignUp', () => {
  let fixture: ComponentFixture<SignUp>;
  let page: HTMLElement;

  const button = () => page.querySelector<HTMLButtonElement>('[data-test=sign-up]')!;
  async function type(name: string, text: string): Promise<void> {
    const input = page.querySelector<HTMLInputElement>(`[data-test=${name}]`)!;
    input.value = text;
    input.dispatchEvent(new Event('input'));
    input.dispatchEvent(new Event('blur'));
    await fixture.whenStable();
  }

  beforeEach(async () => {
    TestBed.configureTestingModule({ providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()] });
    fixture = TestBed.createComponent(SignUp);
    page = fixture.nativeElement;
    await fixture.whenStable();
  });
  afterEach(() => TestBed.inject(HttpTestingController).verify());

  it('keeps the button off while the password error shows, and on again once the password is fixed', async () => {
    expect(button().disabled).toBe(false);
    await type('sign-up-email', 'amara.lab@example.test');
    await type('sign-up-name', 'Amara');
    await type('sign-up-password', 'short');
    expect(page.querySelector('mat-error')?.textContent).toContain('at least 10 characters');
    expect(button().disabled).toBe(true);

    await type('sign-up-password', 'wrist pitch at 20 % torque');
    expect(page.querySelector('mat-error')).toBeNull();
    expect(button().disabled).toBe(false);

    // The rule reads the e-mail: a new e-mail the password contains brings the error (and the off button) back.
    await type('sign-up-email', 'wrist@example.test');
    expect(button().disabled).toBe(true);
  });
});
