import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { signal } from '@angular/core';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import type { Role, SessionUser } from '@kinetwin/shared/protocol/api-types';
import type { LibraryDetail, RevisionDetail, ScenarioAccess } from '@kinetwin/shared/protocol/library-api';
import { parseScenario } from '@kinetwin/shared/scenario/parse-scenario';
import { ARCHIVED_SCENARIO_NOTE } from '@kinetwin/shared/library/archived-scenario';
import { Session } from '../core/session';
import { ScenarioPage } from './scenario-page';

// Demo data (invented numbers).
const document = (() => {
  const parsed = parseScenario({ kind: 'kinetwin/scenario', version: 1, name: 'Gantry', joint: { inertia: 0.05, damping: 0.1, stiffness: 0.2 }, controller: { mode: 'pid', kp: 4 }, horizon: 3 });
  if (!parsed.ok) throw new Error('fixture invalid');
  return parsed.value;
})();

const ACCESS: Record<Role, ScenarioAccess> = {
  viewer: { edit: false, archive: false, signOff: false, comment: false, handOff: false, handOffEdit: false },
  engineer: { edit: true, archive: true, signOff: false, comment: true, handOff: true, handOffEdit: true },
  lead: { edit: false, archive: false, signOff: true, comment: true, handOff: true, handOffEdit: false },
  admin: { edit: true, archive: true, signOff: true, comment: true, handOff: true, handOffEdit: true },
};

let archivedAt: string | null = null;

function detail(role: Role): LibraryDetail {
  // The server's access for an archived scenario: no edits, comments, hand-offs or sign-off.
  if (archivedAt !== null) {
    const access = { ...ACCESS[role], edit: false, comment: false, handOff: false, handOffEdit: false, signOff: false };
    return { id: 9, name: 'Gantry', ownerName: 'Rhea', ownerId: 1, updatedAt: archivedAt, lastChangedBy: 'Rhea', status: 'archived', tags: [], revision: 2, scenario: document, signOff: null, archivedAt, access };
  }
  return { id: 9, name: 'Gantry', ownerName: 'Rhea', ownerId: 1, updatedAt: '2026-12-01T10:00:00.000Z', lastChangedBy: 'Rhea', status: 'draft', tags: [], revision: 2, scenario: document, signOff: null, archivedAt: null, access: ACCESS[role] };
}
const revision: RevisionDetail = { number: 2, note: 'kp up', author: { id: 1, displayName: 'Rhea' }, createdAt: '2026-12-01T10:00:00.000Z', signOff: null, scenarioId: 9, scenario: document };

describe('ScenarioPage controls by role', () => {
  let fixture: ComponentFixture<ScenarioPage>;
  let http: HttpTestingController;
  let root: HTMLElement;

  /** Answers every request the page has made so far, by address. */
  function answerAll(role: Role): void {
    for (const request of http.match(() => true)) {
      const url = request.request.url;
      if (url === '/api/scenarios/9') request.flush(detail(role));
      else if (url === '/api/scenarios/9/revisions') request.flush({ items: [{ ...revision, signOff }] });
      else if (url === '/api/scenarios/9/revisions/2') request.flush({ ...revision, signOff });
      else if (url === '/api/scenarios/9/comments') request.flush({ items: [] });
      else if (url === '/api/scenarios/9/activity') request.flush({ items: [], page: 1, pageSize: 20, total: 0 });
      else if (url === '/api/team') request.flush({ team: { id: 1, name: 'Lab' }, members: [] });
      else throw new Error(`unexpected request ${url}`);
    }
  }

  async function open(role: Role): Promise<void> {
    const user: SessionUser = { id: role === 'engineer' ? 1 : 2, email: `${role}@lab.test`, displayName: role, role };
    TestBed.configureTestingModule({
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting(), { provide: Session, useValue: { user: signal(user).asReadonly() } }],
    });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(ScenarioPage);
    root = fixture.nativeElement;
    fixture.componentRef.setInput('id', '9');
    for (let round = 0; round < 4; round++) {
      await new Promise((resolve) => setTimeout(resolve));
      await fixture.whenStable();
      answerAll(role);
    }
    await fixture.whenStable();
  }

  const shown = (names: string[]) => names.filter((name) => root.querySelector(`[data-test=${name}]`) !== null);
  const CONTROLS = ['save-revision', 'hand-off', 'sign-off', 'comment-body', 'rename', 'archive', 'duplicate', 'export'];

  /** The viewed revision's sign-off; most tests look at an unsigned one. */
  let signOff: RevisionDetail['signOff'] = null;

  afterEach(() => {
    http.verify();
    archivedAt = null;
    signOff = null;
  });

  it('shows a viewer the parameters read-only and no control that changes anything, export aside', async () => {
    await open('viewer');
    expect(root.querySelector('[data-test=scenario-title]')?.textContent).toContain('Gantry');
    expect(root.querySelector('[data-test=read-only-parameters]')).not.toBeNull();
    expect(shown(CONTROLS)).toEqual(['export']);
  });

  it('gives the owning engineer the editor, hand-off, comments, name, archive and duplicate, but no sign-off', async () => {
    await open('engineer');
    expect(shown(CONTROLS)).toEqual(['save-revision', 'hand-off', 'comment-body', 'rename', 'archive', 'duplicate', 'export']);
  });

  it('tells the owner of an archived scenario it must be restored before it can be run, commented on or handed off, with the bench button disabled', async () => {
    archivedAt = '2026-12-01T11:00:00.000Z';
    await open('engineer');
    expect(shown(CONTROLS)).toEqual(['duplicate', 'export']);
    expect(root.querySelector('[data-test=unarchive]')).not.toBeNull();
    expect(root.querySelector('[data-test=scenario-status]')?.textContent?.trim()).toBe('Archived');
    const reason = root.querySelector<HTMLElement>('[data-test=archived-reason]')!;
    expect(reason.textContent?.trim()).toBe(ARCHIVED_SCENARIO_NOTE);
    const bench = root.querySelector<HTMLElement>('[data-test=open-bench]')!;
    expect(bench.tagName).toBe('BUTTON');
    expect(bench.getAttribute('aria-disabled') === 'true' || bench.hasAttribute('disabled')).toBe(true);
    expect(bench.getAttribute('title')).toBe(ARCHIVED_SCENARIO_NOTE);
    expect(bench.getAttribute('aria-describedby')).toBe(reason.id);
    expect(root.querySelector('[data-test=comments-archived]')?.textContent?.trim()).toBe(ARCHIVED_SCENARIO_NOTE);
  });

  it('links a live scenario to its bench', async () => {
    await open('viewer');
    expect(root.querySelector('a[data-test=open-bench]')?.getAttribute('href')).toBe('/bench/9');
    expect(root.querySelector('[data-test=archived-reason]')).toBeNull();
  });

  it('gives a lead sign-off and comments but no editor on a scenario that is not theirs', async () => {
    await open('lead');
    expect(shown(CONTROLS)).toEqual(['hand-off', 'sign-off', 'comment-body', 'duplicate', 'export']);
  });

  it('shows who signed the viewed revision off and the note they wrote', async () => {
    signOff = { by: { id: 4, displayName: 'Ada' }, at: '2026-12-01T12:00:00.000Z', note: 'Checked on the stand at 20 % torque' };
    await open('viewer');
    expect(root.querySelector('[data-test=viewed-signed-off]')?.textContent).toContain('Signed off by Ada');
    expect(root.querySelector('[data-test=sign-off-note]')?.textContent).toContain('Checked on the stand at 20 % torque');
    expect(root.querySelector('[data-test=scenario-status]')?.textContent?.trim()).toBe('Draft');
  });
});
