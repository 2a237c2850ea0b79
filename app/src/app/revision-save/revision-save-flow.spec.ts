import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import type { LibraryDetail, StaleSaveBody } from '@kinetwin/shared/protocol/library-api';
import { parseScenario } from '@kinetwin/shared/scenario/parse-scenario';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import { RevisionSaveFlow } from './revision-save-flow';

// Demo data (invented numbers).
function scenario(kp: number): Scenario {
  const parsed = parseScenario({ kind: 'kinetwin/scenario', version: 1, name: 'Wrist', joint: { inertia: 0.02, damping: 0.05, stiffness: 0, gearRatio: 10 }, controller: { mode: 'pid', kp, kd: 0.1 }, horizon: 2 });
  if (!parsed.ok) throw new Error('fixture invalid');
  return parsed.value;
}
const access = { edit: true, archive: true, signOff: false, comment: true, handOff: true, handOffEdit: true };
const detail = (revision: number, kp: number): LibraryDetail => ({
  id: 5, name: 'Wrist', ownerName: 'Rhea', ownerId: 1, updatedAt: '2026-12-01T10:00:00.000Z', lastChangedBy: 'Rhea', status: 'draft', tags: ['wrist'], revision, scenario: scenario(kp), signOff: null, archivedAt: null, access,
});
const stale: StaleSaveBody = {
  error: { code: 'stale_revision', message: 'Revision 3 was saved after revision 2.' },
  current: { number: 3, note: '', author: { id: 2, displayName: 'Tomás' }, createdAt: '', signOff: null, scenarioId: 5, scenario: scenario(2) },
  yours: { baseRevision: 2, scenario: scenario(3), note: '' },
};

describe('RevisionSaveFlow', () => {
  let flow: RevisionSaveFlow;
  let http: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [RevisionSaveFlow, provideHttpClient(), provideHttpClientTesting()] });
    flow = TestBed.inject(RevisionSaveFlow);
    http = TestBed.inject(HttpTestingController);
  });
  afterEach(() => http.verify());

  const request = { scenarioId: 5, scenario: scenario(3), note: '  firmer  ', baseRevision: 2 };

  it('saves with the trimmed note and says which revision it made', async () => {
    const saving = flow.save(request);
    expect(flow.busy()).toBe(true);
    const put = http.expectOne('/api/scenarios/5');
    expect([put.request.method, put.request.body.note, put.request.body.baseRevision]).toEqual(['PUT', 'firmer', 2]);
    put.flush(detail(3, 3));
    expect((await saving)?.revision).toBe(3);
    expect([flow.busy(), flow.done()]).toEqual([false, 'Saved as revision 3.']);
  });

  it('keeps a conflict until it is resolved, refusing another save meanwhile', async () => {
    const saving = flow.save(request);
    http.expectOne('/api/scenarios/5').flush(stale, { status: 409, statusText: 'Conflict' });
    expect(await saving).toBeNull();
    expect(flow.stale()?.current.number).toBe(3);
    expect(await flow.save(request)).toBeNull();
    http.expectNone('/api/scenarios/5');
    flow.resolve();
    expect(flow.stale()).toBeNull();
  });

  it('names the refused fields of a 400 and forgets them on request', async () => {
    const saving = flow.save(request);
    http.expectOne('/api/scenarios/5').flush(
      { error: { code: 'invalid_scenario', message: 'The scenario is not valid.', fields: [{ field: 'scenario.controller.kp', message: 'kp must be at most 1e6' }] } },
      { status: 400, statusText: 'Bad Request' },
    );
    await saving;
    expect(flow.failure()).toContain('The scenario is not valid.');
    expect(flow.fieldErrors().map((error) => error.field)).toEqual(['scenario.controller.kp']);
    flow.clearMessages();
    expect([flow.failure(), flow.fieldErrors()]).toEqual([null, []]);
  });

  it('after a conflict, loads their revision and ends the conflict', async () => {
    const saving = flow.save(request);
    http.expectOne('/api/scenarios/5').flush(stale, { status: 409, statusText: 'Conflict' });
    await saving;
    const loading = flow.loadTheirs(5);
    http.expectOne('/api/scenarios/5').flush(detail(3, 2));
    expect((await loading)?.revision).toBe(3);
    expect(flow.stale()).toBeNull();
    expect(flow.done()).toContain('your edit was dropped');
  });
});
