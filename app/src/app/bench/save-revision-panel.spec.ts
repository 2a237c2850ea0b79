import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import type { LibraryDetail, ScenarioAccess, StaleSaveBody } from '@kinetwin/shared/protocol/library-api';
import { parseScenario } from '@kinetwin/shared/scenario/parse-scenario';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import { SaveRevisionPanel } from './save-revision-panel';

// Demo data (invented numbers).
function scenario(kp: number): Scenario {
  const parsed = parseScenario({
    kind: 'kinetwin/scenario',
    version: 1,
    name: 'Shoulder',
    joint: { inertia: 0.9, damping: 0.6, stiffness: 0, gearRatio: 50 },
    controller: { mode: 'pid', kp, kd: 0.5 },
    horizon: 3,
  });
  if (!parsed.ok) throw new Error('fixture invalid');
  return parsed.value;
}

const editor: ScenarioAccess = { edit: true, archive: true, signOff: false, comment: true, handOff: true, handOffEdit: true };
const viewer: ScenarioAccess = { edit: false, archive: false, signOff: false, comment: false, handOff: false, handOffEdit: false };
const detail = (revision: number, kp: number, access = editor): LibraryDetail => ({
  id: 4,
  name: 'Shoulder',
  ownerName: 'Rhea',
  ownerId: 1,
  updatedAt: '2026-12-01T10:00:00.000Z',
  lastChangedBy: 'Rhea',
  status: 'draft',
  tags: ['demo'],
  revision,
  scenario: scenario(kp),
  signOff: null,
  archivedAt: null,
  access,
});

describe('SaveRevisionPanel', () => {
  let fixture: ComponentFixture<SaveRevisionPanel>;
  let http: HttpTestingController;
  let root: HTMLElement;
  let replaced: LibraryDetail[];
  let copied: LibraryDetail[];

  async function settle(): Promise<void> {
    await new Promise((resolve) => setTimeout(resolve));
    await fixture.whenStable();
  }

  async function open(base: LibraryDetail, kp: number | null): Promise<void> {
    fixture.componentRef.setInput('detail', base);
    fixture.componentRef.setInput('edited', kp === null ? { ok: true, value: base.scenario } : { ok: true, value: scenario(kp) });
    fixture.componentRef.setInput('changed', kp !== null);
    await settle();
  }

  const button = (name: string) => root.querySelector<HTMLButtonElement>(`[data-test=${name}]`);

  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()] });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(SaveRevisionPanel);
    root = fixture.nativeElement;
    replaced = [];
    copied = [];
    fixture.componentInstance.replaced.subscribe((d) => replaced.push(d));
    fixture.componentInstance.copied.subscribe((d) => copied.push(d));
  });

  afterEach(() => http.verify());

  it('gives a viewer no save controls, only the way to the scenario page', async () => {
    await open(detail(2, 3.2, viewer), 4);
    expect(button('save-revision')).toBeNull();
    expect(root.querySelector('[data-test=revision-note]')).toBeNull();
    expect(root.querySelector('a[data-test=open-scenario-page]')?.getAttribute('href')).toBe('/library/4');
  });

  it('saves nothing until a field is edited, then PUTs the edit on top of the loaded revision', async () => {
    await open(detail(2, 3.2), null);
    expect(button('save-revision')!.disabled).toBe(true);
    await open(detail(2, 3.2), 4);
    button('save-revision')!.click();
    const request = http.expectOne('/api/scenarios/4');
    expect(request.request.method).toBe('PUT');
    expect([request.request.body.baseRevision, request.request.body.scenario.controller.kp]).toEqual([2, 4]);
    request.flush(detail(3, 4));
    await settle();
    expect(replaced.map((d) => d.revision)).toEqual([3]);
  });

  it('on a 409 offers a copy or their revision, and the copy carries my edit', async () => {
    await open(detail(2, 3.2), 4);
    button('save-revision')!.click();
    const stale: StaleSaveBody = {
      error: { code: 'stale_revision', message: 'Revision 3 was saved after revision 2.' },
      current: { number: 3, note: '', author: { id: 3, displayName: 'Inès' }, createdAt: '', signOff: null, scenarioId: 4, scenario: scenario(3.5) },
      yours: { baseRevision: 2, scenario: scenario(4), note: '' },
    };
    http.expectOne('/api/scenarios/4').flush(stale, { status: 409, statusText: 'Conflict' });
    await settle();
    expect(root.querySelector('[data-test=stale-save]')?.textContent).toContain('Inès saved revision 3');
    expect(button('save-revision')!.disabled).toBe(true);

    button('save-as-copy')!.click();
    const create = http.expectOne('/api/scenarios');
    expect(create.request.body.scenario.name).toBe('Shoulder (my edit)');
    expect(create.request.body.scenario.controller.kp).toBe(4);
    create.flush({ ...detail(1, 4), id: 8, name: 'Shoulder (my edit)' });
    await settle();
    expect(copied.map((d) => d.id)).toEqual([8]);
  });

  it('on a 409 can drop my edit and load their revision instead', async () => {
    await open(detail(2, 3.2), 4);
    button('save-revision')!.click();
    http.expectOne('/api/scenarios/4').flush(
      { error: { code: 'stale_revision', message: '…' }, current: { number: 3, note: '', author: { id: 3, displayName: 'Inès' }, createdAt: '', signOff: null, scenarioId: 4, scenario: scenario(3.5) }, yours: { baseRevision: 2, scenario: scenario(4), note: '' } },
      { status: 409, statusText: 'Conflict' },
    );
    await settle();
    button('reload-theirs')!.click();
    http.expectOne('/api/scenarios/4').flush(detail(3, 3.5));
    await settle();
    expect(replaced.map((d) => d.revision)).toEqual([3]);
    expect(root.querySelector('[data-test=stale-save]')).toBeNull();
  });
});
