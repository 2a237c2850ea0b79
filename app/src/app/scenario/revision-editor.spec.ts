import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { type ComponentFixture, TestBed } from '@angular/core/testing';
import type { LibraryDetail, StaleSaveBody } from '@kinetwin/shared/protocol/library-api';
import { parseScenario } from '@kinetwin/shared/scenario/parse-scenario';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import { RevisionEditor } from './revision-editor';

// Demo data (invented numbers).
function scenario(kp: number, ki = 6): Scenario {
  const parsed = parseScenario({
    kind: 'kinetwin/scenario',
    version: 1,
    name: 'Gantry',
    joint: { inertia: 0.05, damping: 0.1, stiffness: 0.2, gearRatio: 5 },
    controller: { mode: 'pid', kp, ki, kd: 0.2 },
    inputs: [{ channel: 'reference', shape: 'step', amplitude: 1 }],
    horizon: 3,
  });
  if (!parsed.ok) throw new Error('fixture invalid');
  return parsed.value;
}

const access = { edit: true, archive: true, signOff: false, comment: true, handOff: true, handOffEdit: true };
function detail(revision: number, doc: Scenario): LibraryDetail {
  return { id: 9, name: doc.name, ownerName: 'Rhea', ownerId: 1, updatedAt: '2026-12-01T10:00:00.000Z', lastChangedBy: 'Rhea', status: 'draft', tags: ['demo'], revision, scenario: doc, signOff: null, archivedAt: null, access };
}

describe('RevisionEditor', () => {
  let fixture: ComponentFixture<RevisionEditor>;
  let http: HttpTestingController;
  let root: HTMLElement;
  let saved: LibraryDetail[];
  let copied: LibraryDetail[];
  let reloads: number;

  async function settle(): Promise<void> {
    await new Promise((resolve) => setTimeout(resolve));
    await fixture.whenStable();
  }

  function type(selector: string, value: string): void {
    const input = root.querySelector<HTMLInputElement>(selector)!;
    input.value = value;
    input.dispatchEvent(new Event('input'));
  }

  const click = (selector: string) => root.querySelector<HTMLButtonElement>(selector)!.click();
  const saveButton = () => root.querySelector<HTMLButtonElement>('[data-test=save-revision]')!;

  beforeEach(async () => {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
    http = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(RevisionEditor);
    root = fixture.nativeElement;
    saved = [];
    copied = [];
    reloads = 0;
    fixture.componentInstance.saved.subscribe((d) => saved.push(d));
    fixture.componentInstance.copied.subscribe((d) => copied.push(d));
    fixture.componentInstance.reloadRequested.subscribe(() => reloads++);
    fixture.componentRef.setInput('detail', detail(3, scenario(4)));
    await settle();
  });

  afterEach(() => http.verify());

  it('saves the edited scenario on top of the revision it started from', async () => {
    expect(saveButton().disabled).toBe(true);
    type('[data-test="param-controller.kp"]', '6.5');
    type('[data-test=revision-note]', 'stiffer loop');
    await settle();
    expect(saveButton().disabled).toBe(false);
    click('[data-test=save-revision]');
    const request = http.expectOne('/api/scenarios/9');
    expect(request.request.method).toBe('PUT');
    expect(request.request.body.baseRevision).toBe(3);
    expect(request.request.body.note).toBe('stiffer loop');
    expect(request.request.body.scenario.controller.kp).toBe(6.5);
    request.flush(detail(4, scenario(6.5)));
    await settle();
    expect(saved.map((d) => d.revision)).toEqual([4]);
  });

  it('keeps save off and names the field while an edit is not a number', async () => {
    type('[data-test="param-joint.inertia"]', '-0.2');
    await settle();
    expect(saveButton().disabled).toBe(true);
    expect(root.querySelector('[data-test=param-error]')?.textContent).toContain('inertia');
  });

  describe('when someone saved first (409)', () => {
    const stale: StaleSaveBody = {
      error: { code: 'stale_revision', message: 'Revision 4 was saved after revision 3.' },
      current: { number: 4, note: 'integral up', author: { id: 2, displayName: 'Tomás' }, createdAt: '2026-12-01T11:00:00.000Z', signOff: null, scenarioId: 9, scenario: scenario(4, 9) },
      yours: { baseRevision: 3, scenario: scenario(6.5), note: 'stiffer loop' },
    };

    async function saveIntoConflict(): Promise<void> {
      type('[data-test="param-controller.kp"]', '6.5');
      await settle();
      click('[data-test=save-revision]');
      http.expectOne('/api/scenarios/9').flush(stale, { status: 409, statusText: 'Conflict' });
      await settle();
    }

    it('offers the three ways out, saving nothing yet and keeping the edit on screen', async () => {
      await saveIntoConflict();
      const panel = root.querySelector('[data-test=stale-save]')!;
      expect(panel.textContent).toContain('Tomás saved revision 4');
      expect(['save-as-copy', 'merge-onto-theirs', 'reload-theirs'].map((name) => panel.querySelector(`[data-test=${name}]`) !== null)).toEqual([true, true, true]);
      expect(root.querySelector<HTMLInputElement>('[data-test="param-controller.kp"]')!.value).toBe('6.5');
      expect(saveButton().disabled).toBe(true);
      expect(saved).toEqual([]);
    });

    it('saves my version as a new scenario with a copy name', async () => {
      await saveIntoConflict();
      click('[data-test=save-as-copy]');
      const request = http.expectOne('/api/scenarios');
      expect(request.request.method).toBe('POST');
      expect(request.request.body.scenario.name).toBe('Gantry (my edit)');
      expect(request.request.body.scenario.controller.kp).toBe(6.5);
      expect(request.request.body.tags).toEqual(['demo']);
      request.flush({ ...detail(1, scenario(6.5)), id: 12 });
      await settle();
      expect(copied.map((d) => d.id)).toEqual([12]);
      expect(root.querySelector('[data-test=stale-save]')).toBeNull();
    });

    it('puts my edit on their revision: their other changes kept, mine on top, based on their number', async () => {
      await saveIntoConflict();
      click('[data-test=merge-onto-theirs]');
      await settle();
      expect(reloads).toBe(1);
      // The page reloads and hands the newer detail back in.
      fixture.componentRef.setInput('detail', detail(4, scenario(4, 9)));
      await settle();
      expect(root.querySelector<HTMLInputElement>('[data-test="param-controller.kp"]')!.value).toBe('6.5');
      expect(root.querySelector<HTMLInputElement>('[data-test="param-controller.ki"]')!.value).toBe('9');
      click('[data-test=save-revision]');
      const request = http.expectOne('/api/scenarios/9');
      expect(request.request.body.baseRevision).toBe(4);
      expect([request.request.body.scenario.controller.kp, request.request.body.scenario.controller.ki]).toEqual([6.5, 9]);
      request.flush(detail(5, scenario(6.5, 9)));
      await settle();
      expect(saved.map((d) => d.revision)).toEqual([5]);
    });

    it('drops my edit when I reload theirs', async () => {
      await saveIntoConflict();
      click('[data-test=reload-theirs]');
      await settle();
      expect(reloads).toBe(1);
      fixture.componentRef.setInput('detail', detail(4, scenario(4, 9)));
      await settle();
      expect(root.querySelector<HTMLInputElement>('[data-test="param-controller.kp"]')!.value).toBe('4');
      expect(root.querySelector('[data-test=stale-save]')).toBeNull();
    });
  });

  it('shows any other failure as the server words it', async () => {
    type('[data-test="param-controller.kp"]', '5');
    await settle();
    click('[data-test=save-revision]');
    http.expectOne('/api/scenarios/9').flush({ error: { code: 'forbidden', message: 'You may not edit this scenario.' } }, { status: 403, statusText: 'Forbidden' });
    await settle();
    expect(root.querySelector('[data-test=save-error]')?.textContent).toContain('You may not edit this scenario.');
    expect(root.querySelector('[data-test=stale-save]')).toBeNull();
  });

  it('offers no controller gains for an open-loop scenario', async () => {
    const open = parseScenario({ ...scenario(4), controller: { mode: 'open-loop' }, inputs: [{ channel: 'torque', shape: 'step', amplitude: 0.1 }] });
    if (!open.ok) throw new Error('fixture invalid');
    fixture.componentRef.setInput('detail', detail(5, open.value));
    await settle();
    expect(root.querySelector('[data-test="param-controller.kp"]')).toBeNull();
    expect(root.querySelector('[data-test="param-joint.inertia"]')).not.toBeNull();
  });
});
