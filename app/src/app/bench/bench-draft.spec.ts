import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import type { LibraryDetail } from '@kinetwin/shared/protocol/library-api';
import { parseScenario } from '@kinetwin/shared/scenario/parse-scenario';
import { MAX_INPUT_TERMS, type Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import { BenchDraft } from './bench-draft';

// Demo data (invented numbers).
function scenario(kp: number): Scenario {
  const parsed = parseScenario({
    kind: 'kinetwin/scenario', version: 1, name: 'Elbow',
    joint: { inertia: 0.05, damping: 0.1, stiffness: 0, gearRatio: 1 },
    controller: { mode: 'pid', kp, kd: 0.2 },
    inputs: [{ channel: 'reference', shape: 'step', amplitude: 0.4 }],
    horizon: 2,
  });
  if (!parsed.ok) throw new Error('fixture invalid');
  return parsed.value;
}
const access = { edit: true, archive: true, signOff: false, comment: true, handOff: true, handOffEdit: true };
const detail = (revision: number, kp: number): LibraryDetail => ({
  id: 3, name: 'Elbow', ownerName: 'Rhea', ownerId: 1, updatedAt: '2026-12-01T10:00:00.000Z', lastChangedBy: 'Rhea', status: 'draft', tags: [], revision, scenario: scenario(kp), signOff: null, archivedAt: null, access,
});
const kick = { channel: 'torque', shape: 'impulse', amplitude: 0.01, delay: 0.5 } as const;

describe('BenchDraft', () => {
  let draft: BenchDraft;
  let http: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [BenchDraft, provideHttpClient(), provideHttpClientTesting()] });
    draft = TestBed.inject(BenchDraft);
    http = TestBed.inject(HttpTestingController);
    draft.open('3');
    TestBed.tick();
    http.expectOne('/api/scenarios/3').flush(detail(1, 2));
  });
  afterEach(() => http.verify());

  it('applies typed edits over the stored scenario and runs by id only when nothing changed', () => {
    expect(draft.runChoice()).toMatchObject({ ok: true, request: { scenarioId: 3 } });
    draft.edit('controller.kp', '5');
    const edited = draft.edited();
    expect(edited?.ok && edited.value.controller.kp).toBe(5);
    expect(draft.changed()).toBe(true);
    expect(draft.runChoice()).toMatchObject({ ok: true, inline: true });
    draft.edit('joint.inertia', 'heavy');
    expect(draft.errors().map((error) => error.field)).toEqual(['joint.inertia']);
    // What the bench shows stays the last valid scenario: the stored one.
    expect(draft.current()?.joint.inertia).toBe(0.05);
  });

  it('keeps terms after the stored inputs, refusing past the term limit, and a new revision starts afresh', () => {
    expect(draft.keepTerms([kick]).ok).toBe(true);
    expect(draft.base()?.inputs.map((term) => term.shape)).toEqual(['step', 'impulse']);
    expect(draft.changed()).toBe(true);
    const over = draft.keepTerms(Array.from({ length: MAX_INPUT_TERMS }, () => kick));
    expect(over.ok ? null : over.errors[0]!.field).toBe('inputs');
    expect(draft.base()?.inputs).toHaveLength(2);

    draft.showRevision(detail(2, 3));
    expect([draft.changed(), draft.base()?.inputs.length, draft.current()?.controller.kp]).toEqual([false, 1, 3]);
  });
});
