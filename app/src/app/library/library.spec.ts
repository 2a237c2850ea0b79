import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import type { ScenarioSummary } from '@kinetwin/shared/protocol/api-types';
import { Library } from './library';

// Built from local times so the expected text holds in any time zone.
const items: ScenarioSummary[] = [
  { id: 3, name: 'Demo shoulder step', ownerName: 'Demo Engineer', updatedAt: new Date(2026, 2, 14, 9, 5).toISOString() },
  { id: 11, name: 'Demo wrist kick', ownerName: 'Demo Lead', updatedAt: new Date(2026, 10, 2, 17, 45).toISOString() },
];

describe('Library', () => {
  let fixture: ComponentFixture<Library>;
  let http: HttpTestingController;
  let page: HTMLElement;

  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()] });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(Library);
    page = fixture.nativeElement;
  });

  afterEach(() => http.verify());

  it('shows one row per scenario with name, owner and update time, each name linking to its bench', async () => {
    await fixture.whenStable();
    expect(page.textContent).toContain('Loading scenarios');
    http.expectOne('/api/scenarios').flush({ items });
    await fixture.whenStable();

    const rows = [...page.querySelectorAll<HTMLElement>('[data-test=scenario-row]')];
    expect(rows).toHaveLength(2);
    const cells = rows.map((row) => [...row.querySelectorAll('td')].map((cell) => cell.textContent?.trim()));
    expect(cells).toEqual([
      ['Demo shoulder step', 'Demo Engineer', '2026-03-14 09:05'],
      ['Demo wrist kick', 'Demo Lead', '2026-11-02 17:45'],
    ]);
    const links = rows.map((row) => row.querySelector<HTMLAnchorElement>('a[data-test=open-scenario]')!);
    expect(links.map((a) => a.getAttribute('href'))).toEqual(['/bench/3', '/bench/11']);
  });

  it('says so when the library is empty', async () => {
    http.expectOne('/api/scenarios').flush({ items: [] });
    await fixture.whenStable();
    expect(page.querySelectorAll('[data-test=scenario-row]')).toHaveLength(0);
    expect(page.querySelector('[data-test=library-empty]')?.textContent).toContain('No scenarios');
  });

  it("shows the server's error message when the list cannot be loaded", async () => {
    http.expectOne('/api/scenarios').flush({ error: { code: 'db_unavailable', message: 'The database is not answering; try again shortly.' } }, { status: 503, statusText: 'Service Unavailable' });
    await fixture.whenStable();
    expect(page.querySelector('[data-test=library-error]')?.textContent?.trim()).toBe('The database is not answering; try again shortly.');
    expect(page.querySelector('table')).toBeNull();
  });
});
