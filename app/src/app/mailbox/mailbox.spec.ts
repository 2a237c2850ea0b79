import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { Mailbox } from './mailbox';

describe('Mailbox', () => {
  it('shows the links in a message as links and the rest as text', async () => {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
    const http = TestBed.inject(HttpTestingController);
    const fixture = TestBed.createComponent(Mailbox);
    await fixture.whenStable();
    const text = 'Tomás invited you. Accept: http://127.0.0.1:4300/invitations/abc123\n<b>not bold</b>';
    http.expectOne('/api/dev/mailbox').flush({ items: [{ id: 1, to: 'amara@lab.test', subject: 'Invitation', text, createdAt: '2026-12-01T10:00:00.000Z' }] });
    await fixture.whenStable();
    const page = fixture.nativeElement as HTMLElement;
    const links = [...page.querySelectorAll<HTMLAnchorElement>('[data-test=mail-link]')];
    expect(links.map((a) => a.getAttribute('href'))).toEqual(['http://127.0.0.1:4300/invitations/abc123']);
    expect(page.querySelector('[data-test=mail-text]')?.textContent).toBe(text);
    expect(page.querySelector('[data-test=mail-text] b')).toBeNull();
    http.verify();
  });
});
