import { Injectable, computed, inject, signal } from '@angular/core';
import { toObservable, toSignal } from '@angular/core/rxjs-interop';
import type { LibraryDetail } from '@kinetwin/shared/protocol/library-api';
import { applyFieldEdits } from '@kinetwin/shared/scenario/field-edits';
import type { InputTerm, Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import { withAppendedTerms } from '@kinetwin/shared/twin/kick-rule';
import type { Parsed } from '@kinetwin/shared/validation/field-errors';
import { catchError, filter, map, of, startWith, switchMap } from 'rxjs';
import { apiErrorMessage } from '../core/api-error-message';
import type { LoadState } from '../core/load-state';
import { ScenarioApi } from '../core/scenario-api';
import { runChoice, type RunChoice } from './run-choice';
import type { ScenarioEdits } from './scenario-draft';
import { describeInputTerm, scenarioFacts } from './scenario-facts';

/**
 * The bench's scenario and its unsaved draft: the stored scenario (loaded by id, or a newer
 * revision the save panel brought in), the kicks kept as forcing terms, and the typed edits.
 * Another scenario or revision starts a fresh draft. Provided by the bench component.
 */
@Injectable()
export class BenchDraft {
  private readonly scenarios = inject(ScenarioApi);

  private readonly scenarioId = signal<string | null>(null);
  /** The stored scenario as fetched for the current id. */
  readonly loaded = toSignal(
    toObservable(this.scenarioId).pipe(
      filter((id): id is string => id !== null),
      switchMap((id) =>
        this.scenarios.get(id).pipe(
          map((value): LoadState<LibraryDetail> => ({ status: 'ready', value })),
          catchError((failure: unknown) => of<LoadState<LibraryDetail>>({ status: 'failed', message: apiErrorMessage(failure) })),
          startWith<LoadState<LibraryDetail>>({ status: 'loading' }),
        ),
      ),
    ),
    { initialValue: { status: 'loading' } as LoadState<LibraryDetail> },
  );

  /** A newer revision the save panel brought in (after a save, or theirs after a conflict). */
  private readonly replaced = signal<LibraryDetail | null>(null);
  private readonly typed = signal<ScenarioEdits>({});
  readonly edits = this.typed.asReadonly();
  /** Kicks of earlier runs kept as forcing terms, after the stored inputs. */
  private readonly kept = signal<readonly InputTerm[]>([]);
  readonly hasKeptTerms = computed(() => this.kept().length > 0);

  /** The scenario on the bench as stored; null until it loads. */
  readonly detail = computed((): LibraryDetail | null => {
    const replaced = this.replaced();
    if (replaced) return replaced;
    const state = this.loaded();
    return state.status === 'ready' ? state.value : null;
  });
  readonly loadFailure = computed(() => {
    const state = this.loaded();
    return state.status === 'failed' ? state.message : '';
  });
  /** The stored scenario with the kept kicks appended: what the tuning fields start from. */
  readonly base = computed((): Scenario | null => {
    const detail = this.detail();
    if (!detail) return null;
    const base = withAppendedTerms(detail.scenario, this.kept());
    // keepTerms checks the term limit first, so this holds; the stored scenario is the safe fallback.
    return base.ok ? base.value : detail.scenario;
  });
  /** The draft (kept kicks, then the edits) applied and validated; null before it loads. */
  readonly edited = computed((): Parsed<Scenario> | null => {
    const base = this.base();
    return base ? applyFieldEdits(base, this.typed()) : null;
  });
  readonly changed = computed(() => Object.keys(this.typed()).length > 0 || this.kept().length > 0);
  readonly errors = computed(() => {
    const edited = this.edited();
    return edited && !edited.ok ? edited.errors : [];
  });
  /** What the bench shows: the draft while it is valid, else the stored scenario. */
  readonly current = computed((): Scenario | null => {
    const edited = this.edited();
    if (edited?.ok) return edited.value;
    return this.detail()?.scenario ?? null;
  });
  readonly facts = computed(() => {
    const scenario = this.current();
    return scenario ? scenarioFacts(scenario) : [];
  });
  readonly inputs = computed(() => (this.current()?.inputs ?? []).map((term, index) => ({ index, text: describeInputTerm(term) })));
  readonly horizon = computed(() => this.current()?.horizon ?? 1);
  readonly closedLoop = computed(() => this.current()?.controller.mode === 'pid');

  /** Opens a scenario by id (from the route); a revision brought in for another one is dropped. */
  open(id: string): void {
    if (id === this.scenarioId()) return;
    this.replaced.set(null);
    this.scenarioId.set(id);
    this.restart();
  }

  /** Shows a newer revision of the same scenario, with a fresh draft. */
  showRevision(detail: LibraryDetail): void {
    this.replaced.set(detail);
    this.restart();
  }

  /** Forgets a brought-in revision (the edit went into a copy, which opens by id). */
  dropRevision(): void {
    this.replaced.set(null);
  }

  /** Records one field's text; validation and everything downstream follow from the signals. */
  edit(path: string, text: string): void {
    this.typed.update((edits) => ({ ...edits, [path]: text }));
  }

  /** Back to the stored scenario: no edits, no kept kicks. */
  restart(): void {
    this.typed.set({});
    this.kept.set([]);
  }

  /** Keeps terms (a run's kicks) after the draft's inputs, or says why the draft cannot take them. */
  keepTerms(terms: readonly InputTerm[]): Parsed<readonly InputTerm[]> {
    const base = this.base();
    if (!base) return { ok: false, errors: [{ field: '', message: 'the scenario has not loaded yet' }] };
    const appended = withAppendedTerms(base, terms);
    if (!appended.ok) return appended;
    this.kept.update((kept) => [...kept, ...terms]);
    return { ok: true, value: terms };
  }

  /** The run request for the draft: the stored scenario by id unless the draft changes it. */
  runChoice(): RunChoice | null {
    const detail = this.detail();
    return detail ? runChoice(detail.id, detail.scenario, this.typed(), this.kept()) : null;
  }
}
