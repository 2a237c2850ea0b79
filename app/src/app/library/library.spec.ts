import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import type { LibraryItem, LibraryPage, TeamResponse } from '@kinetwin/shared/protocol/library-api';
import { ARCHIVED_SCENARIO_NOTE } from '@kinetwin/shared/library/archived-scenario';
import { Library, SEARCH_DEBOUNCE_MS } from './library';

// Built from local times so the expected text holds in any time zone. Demo data.
const items: LibraryItem[] = [
  { id: 3, name: 'Demo shoulder step', ownerName: 'Demo Engineer', ownerId: 1, updatedAt: new Date(2026, 2, 14, 9, 5).toISOString(), lastChangedBy: 'Demo Engineer', status: 'draft', tags: ['demo'], revision: 2 },
  { id: 11, name: 'Demo wrist kick', ownerName: 'Demo Lead', ownerId: 2, updatedAt: new Date(2026, 10, 2, 17, 45).toISOString(), lastChangedBy: 'Demo Lead', status: 'signed-off', tags: [], revision: 5 },
];
const team: TeamResponse = { team: { id: 1, name: 'Lab' }, members: [] };
const page = (list: LibraryItem[], total = list.length): LibraryPage => ({ items: list, page: 1, pageSize: 25, total });

describe('Library', () => {
  let fixture: ComponentFixture<Library>;
  let http: HttpTestingController;
  let root: HTMLElement;

  async function settle(ms = 0): Promise<void> {
    await new Promise((resolve) => setTimeout(resolve, ms));
    await fixture.whenStable();
  }

  beforeEach(async () => {
    TestBed.configureTestingModule({ providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()] });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(Library);
    root = fixture.nativeElement;
    await settle();
    http.expectOne('/api/team').flush(team);
    // The first query waits one tick (the debounce of typing is 0 for anything but the search).
    await settle();
  });

  afterEach(() => http.verify());

  const listRequest = () => http.expectOne((request) => request.url === '/api/scenarios');

  it('shows one row per scenario with name, owner, status, tags and last change; each name links to its bench', async () => {
    expect(root.textContent).toContain('Loading scenarios');
    const request = listRequest();
    expect(request.request.params.toString()).toBe('sort=updatedAt&order=desc&page=1&pageSize=25');
    request.flush(page(items));
    await settle();

    const rows = [...root.querySelectorAll<HTMLElement>('[data-test=scenario-row]')];
    expect(rows).toHaveLength(2);
    const cells = rows.map((row) => [...row.querySelectorAll('td')].slice(0, 4).map((cell) => cell.textContent?.trim()));
    expect(cells).toEqual([
      ['Demo shoulder step', 'Demo Engineer', 'Draft', 'demo'],
      ['Demo wrist kick', 'Demo Lead', 'Signed off', ''],
    ]);
    const changes = rows.map((row) => [...row.querySelectorAll('td')[4]!.querySelectorAll('time, .by')].map((part) => part.textContent?.trim()));
    expect(changes).toEqual([
      ['2026-03-14 09:05', 'Demo Engineer', 'revision 2'],
      ['2026-11-02 17:45', 'Demo Lead', 'revision 5'],
    ]);
    const links = rows.map((row) => row.querySelector<HTMLAnchorElement>('a[data-test=open-scenario]')!);
    expect(links.map((a) => a.getAttribute('href'))).toEqual(['/bench/3', '/bench/11']);
    expect(rows[0]!.querySelector('a[data-test=open-scenario-page]')?.getAttribute('href')).toBe('/library/3');
  });

  it('shows an archived scenario without a bench link, saying it must be restored before it can be run, commented on or handed off', async () => {
    const archived: LibraryItem = { ...items[0]!, id: 4, name: 'Demo retired elbow', status: 'archived' };
    listRequest().flush(page([archived, items[1]!]));
    await settle();
    const [archivedRow, liveRow] = [...root.querySelectorAll<HTMLElement>('[data-test=scenario-row]')];
    expect(archivedRow!.querySelector('a[data-test=open-scenario]')).toBeNull();
    expect(archivedRow!.querySelector('[data-test=archived-name]')?.textContent?.trim()).toBe('Demo retired elbow');
    const note = archivedRow!.querySelector<HTMLElement>('[data-test=archived-note]')!;
    expect(note.textContent?.trim()).toBe(ARCHIVED_SCENARIO_NOTE);
    expect(ARCHIVED_SCENARIO_NOTE).toBe('This scenario is archived; restore it before running it, commenting on it or handing it off.');
    expect(archivedRow!.querySelector('[data-test=archived-name]')?.getAttribute('aria-describedby')).toBe(note.id);
    expect(archivedRow!.querySelector('[data-test=scenario-status]')?.textContent?.trim()).toBe('Archived');
    // Its page, where it is restored, stays one click away; a live row keeps its bench link.
    expect(archivedRow!.querySelector('a[data-test=open-scenario-page]')?.getAttribute('href')).toBe('/library/4');
    expect(liveRow!.querySelector('a[data-test=open-scenario]')?.getAttribute('href')).toBe('/bench/11');
    expect(liveRow!.querySelector('[data-test=archived-note]')).toBeNull();
  });

  it('asks the server again after a pause in typing, from the first page', async () => {
    listRequest().flush(page(items, 60));
    await settle();
    const search = root.querySelector<HTMLInputElement>('[data-test=library-search]')!;
    search.value = 'wrist';
    search.dispatchEvent(new Event('input'));
    await settle();
    http.expectNone((request) => request.url === '/api/scenarios');
    await settle(SEARCH_DEBOUNCE_MS + 20);
    const request = listRequest();
    expect(request.request.params.get('q')).toBe('wrist');
    expect(request.request.params.get('page')).toBe('1');
    request.flush(page([items[1]!]));
    await settle();
    expect(root.querySelectorAll('[data-test=scenario-row]')).toHaveLength(1);
  });

  it('filters by a tag when its chip is clicked', async () => {
    listRequest().flush(page(items));
    await settle();
    root.querySelector<HTMLButtonElement>('[data-test=scenario-tag]')!.click();
    await settle();
    await settle();
    expect(listRequest().request.params.get('tag')).toBe('demo');
  });

  it('says so when no scenario matches', async () => {
    listRequest().flush(page([]));
    await settle();
    expect(root.querySelectorAll('[data-test=scenario-row]')).toHaveLength(0);
    expect(root.querySelector('[data-test=library-empty]')?.textContent).toContain('No scenarios');
  });

  it("shows the server's error message when the list cannot be loaded", async () => {
    listRequest().flush({ error: { code: 'db_unavailable', message: 'The database is not answering; try again shortly.' } }, { status: 503, statusText: 'Service Unavailable' });
    await settle();
    expect(root.querySelector('[data-test=library-error]')?.textContent?.trim()).toBe('The database is not answering; try again shortly.');
    expect(root.querySelector('table')).toBeNull();
  });
});
