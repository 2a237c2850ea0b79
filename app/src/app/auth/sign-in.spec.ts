import { Component } from '@angular/core';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { Router, provideRouter } from '@angular/router';
import type { AppInfo } from '@kinetwin/shared/protocol/api-types';
import { SignIn } from './sign-in';

@Component({ selector: 'kt-library-landing', template: 'landing' })
class LibraryLanding {}

const demoInfo: AppInfo = {
  version: '0.1.0',
  demoMode: true,
  demoAccounts: [
    { email: 'engineer@demo.kinetwin.test', password: 'demo-engineer-pass', role: 'engineer', displayName: 'Demo Engineer' },
    { email: 'lead@demo.kinetwin.test', password: 'demo-lead-pass', role: 'lead', displayName: 'Demo Lead' },
  ],
};

describe('SignIn', () => {
  let fixture: ComponentFixture<SignIn>;
  let http: HttpTestingController;
  let page: HTMLElement;

  async function open(info: AppInfo): Promise<void> {
    fixture = TestBed.createComponent(SignIn);
    page = fixture.nativeElement;
    http.expectOne('/api/app-info').flush(info);
    await fixture.whenStable();
  }

  function type(selector: string, value: string): void {
    const input = page.querySelector<HTMLInputElement>(selector)!;
    input.value = value;
    input.dispatchEvent(new Event('input'));
  }

  /** Lets the component's awaited request finish (a macrotask) and the view catch up. */
  async function settle(): Promise<void> {
    await new Promise((resolve) => setTimeout(resolve));
    await fixture.whenStable();
  }

  async function submit(): Promise<void> {
    page.querySelector<HTMLButtonElement>('[data-test=sign-in]')!.click();
    await settle();
  }

  const errorText = () => page.querySelector('[data-test=sign-in-error]')?.textContent?.trim() ?? null;

  beforeEach(() => {
    TestBed.configureTestingModule({
      providers: [provideRouter([{ path: 'library', component: LibraryLanding }]), provideHttpClient(), provideHttpClientTesting()],
    });
    http = TestBed.inject(HttpTestingController);
  });

  afterEach(() => http.verify());

  it("shows the server's message for a wrong password and stays on the page", async () => {
    await open({ ...demoInfo, demoMode: false, demoAccounts: [] });
    expect(errorText()).toBeNull();
    type('input[name=email]', 'engineer@demo.kinetwin.test');
    type('input[name=password]', 'not-the-password');
    await submit();

    const request = http.expectOne('/api/auth/sign-in');
    expect(request.request.method).toBe('POST');
    expect(request.request.body).toEqual({ email: 'engineer@demo.kinetwin.test', password: 'not-the-password' });
    request.flush({ error: { code: 'bad_credentials', message: 'Email or password is incorrect.' } }, { status: 401, statusText: 'Unauthorized' });
    await settle();

    expect(errorText()).toBe('Email or password is incorrect.');
    expect(TestBed.inject(Router).url).toBe('/');
  });

  it('shows the rate-limit message and clears the error on the next attempt', async () => {
    await open({ ...demoInfo, demoMode: false });
    type('input[name=email]', 'a@b.test');
    type('input[name=password]', 'x');
    await submit();
    http
      .expectOne('/api/auth/sign-in')
      .flush({ error: { code: 'rate_limited', message: 'Too many sign-in attempts. Wait a minute and try again.' } }, { status: 429, statusText: 'Too Many Requests' });
    await settle();
    expect(errorText()).toBe('Too many sign-in attempts. Wait a minute and try again.');

    await submit();
    expect(errorText()).toBeNull();
    http.expectOne('/api/auth/sign-in').flush({ error: { code: 'bad_credentials', message: 'Email or password is incorrect.' } }, { status: 401, statusText: 'Unauthorized' });
    await settle();
    expect(errorText()).toBe('Email or password is incorrect.');
  });

  it('says the server is unreachable when the request never gets an answer', async () => {
    await open({ ...demoInfo, demoMode: false });
    type('input[name=email]', 'a@b.test');
    type('input[name=password]', 'x');
    await submit();
    http.expectOne('/api/auth/sign-in').error(new ProgressEvent('error'), { status: 0 });
    await settle();
    expect(errorText()).toContain('Cannot reach the Kinetwin server');
  });

  it('sends nothing while the form is incomplete and says which field is missing', async () => {
    await open({ ...demoInfo, demoMode: false });
    await submit();
    http.expectNone('/api/auth/sign-in');
    expect(page.textContent).toContain('Enter your email address.');
    expect(page.textContent).toContain('Enter your password.');
  });

  it('hides the demo accounts unless the server is in demo mode', async () => {
    await open({ ...demoInfo, demoMode: false });
    expect(page.querySelector('[data-test=demo-accounts]')).toBeNull();
    expect(page.textContent).not.toContain('demo-engineer-pass');
  });

  it('lists the demo accounts in demo mode, fills the form from one and signs in to the library', async () => {
    await open(demoInfo);
    const panel = page.querySelector('[data-test=demo-accounts]')!;
    expect(panel.textContent).toContain('engineer@demo.kinetwin.test');
    expect(panel.textContent).toContain('demo-lead-pass');

    panel.querySelectorAll<HTMLButtonElement>('[data-test=use-demo-account]')[1].click();
    await fixture.whenStable();
    expect(page.querySelector<HTMLInputElement>('input[name=email]')!.value).toBe('lead@demo.kinetwin.test');
    expect(page.querySelector<HTMLInputElement>('input[name=password]')!.value).toBe('demo-lead-pass');

    await submit();
    const request = http.expectOne('/api/auth/sign-in');
    expect(request.request.body).toEqual({ email: 'lead@demo.kinetwin.test', password: 'demo-lead-pass' });
    request.flush({ user: { id: 2, email: 'lead@demo.kinetwin.test', displayName: 'Demo Lead', role: 'lead' } });
    await settle();
    expect(TestBed.inject(Router).url).toBe('/library');
  });
});
