import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, effect, inject, input, linkedSignal, signal } from '@angular/core';
import { toObservable, toSignal } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { Title } from '@angular/platform-browser';
import { Router, RouterLink } from '@angular/router';
import type { ActivityPage, Comment, LibraryDetail, RevisionDetail, RevisionDiff, RevisionSummary, TeamMember } from '@kinetwin/shared/protocol/library-api';
import { SAFETY_CAUTION, SCENARIO_STATUS_LABELS } from '@kinetwin/shared/protocol/library-api';
import { ARCHIVED_SCENARIO_NOTE } from '@kinetwin/shared/library/archived-scenario';
import { combineLatest, firstValueFrom, map, of, switchMap } from 'rxjs';
import { apiErrorMessage, apiFieldErrors } from '../core/api-error-message';
import { LibraryApi } from '../core/library-api';
import type { LoadState } from '../core/load-state';
import { Session } from '../core/session';
import { TeamApi } from '../core/team-api';
import { readyValue, toLoadState } from '../core/to-load-state';
import { activityText } from './activity-text';
import { CommentThread } from './comment-thread';
import { HandOffDialog } from './hand-off-dialog';
import { RevisionDiffView } from './revision-diff-view';
import { readOnlyFacts } from './read-only-facts';
import { RevisionEditor } from './revision-editor';
import { scenarioControls } from './scenario-controls';
import { SignOffDialog } from './sign-off-dialog';
import { staleSaveOf } from '../revision-save/stale-save';

/** Entries of the scenario's activity log shown at once. */
export const ACTIVITY_PAGE_SIZE = 20;

/** The pair of revisions chosen for the diff, oldest first. */
interface ComparePair {
  from: number;
  to: number;
}

/**
 * One scenario of the library (`/library/:id?revision=n`): its revisions, the one on view
 * read-only or editable when it is the newest, restore, diff with the closed-form overlay,
 * comments, hand-off, sign-off, activity, export and the scenario's own name, tags and archive.
 */
@Component({
  selector: 'kt-scenario-page',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [CommentThread, DatePipe, HandOffDialog, MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, RevisionDiffView, RevisionEditor, RouterLink, SignOffDialog],
  templateUrl: './scenario-page.html',
  styleUrl: './scenario-page.css',
})
export class ScenarioPage {
  private readonly library = inject(LibraryApi);
  private readonly router = inject(Router);
  private readonly session = inject(Session);
  private readonly title = inject(Title);

  /** Scenario id from the route. */
  readonly id = input.required<string>();
  /** Revision on view from `?revision=`; the newest when absent. */
  readonly revision = input<string | undefined>(undefined);

  private readonly reloads = signal(0);
  private readonly commentReloads = signal(0);
  private readonly openPanel = signal<'hand-off' | 'sign-off' | null>(null);
  protected readonly panel = this.openPanel.asReadonly();
  protected readonly statusLabel = SCENARIO_STATUS_LABELS;
  private readonly compareChoice = signal<number[]>([]);
  protected readonly compareSelection = this.compareChoice.asReadonly();
  private readonly actionMessage = signal<{ error: boolean; text: string } | null>(null);
  protected readonly message = this.actionMessage.asReadonly();
  private readonly busy = signal(false);
  protected readonly working = this.busy.asReadonly();
  private readonly nameDraft = signal<string | null>(null);
  private readonly tagsDraft = signal<string | null>(null);

  private readonly idAndReload = computed(() => ({ id: this.id(), reload: this.reloads() }));
  protected readonly detailState = toSignal(
    toObservable(this.idAndReload).pipe(switchMap(({ id }) => this.library.get(id).pipe(toLoadState()))),
    { initialValue: { status: 'loading' } as LoadState<LibraryDetail> },
  );
  /** The scenario; a reload keeps showing the previous answer for the same id until the new one arrives. */
  protected readonly detail = linkedSignal<LoadState<LibraryDetail>, LibraryDetail | null>({
    source: this.detailState,
    computation: (state, previous) => {
      if (state.status === 'ready') return state.value;
      const kept = previous?.value;
      return state.status === 'loading' && kept && String(kept.id) === this.id() ? kept : null;
    },
  });
  protected readonly loadFailure = computed(() => {
    const state = this.detailState();
    return state.status === 'failed' ? state.message : null;
  });
  private readonly revisionsState = toSignal(
    toObservable(this.idAndReload).pipe(switchMap(({ id }) => this.library.revisions(id).pipe(toLoadState()))),
    { initialValue: { status: 'loading' } as LoadState<RevisionSummary[]> },
  );
  protected readonly revisions = computed(() => readyValue(this.revisionsState()) ?? []);
  protected readonly members = toSignal(
    inject(TeamApi)
      .team()
      .pipe(
        map((team) => team.members),
        toLoadState(),
        map((state) => readyValue(state) ?? []),
      ),
    { initialValue: [] as TeamMember[] },
  );

  /** The revision on view: the one asked for in the address, else the newest. */
  protected readonly viewed = computed(() => {
    const detail = this.detail();
    const asked = Number(this.revision());
    if (Number.isInteger(asked) && asked > 0) return asked;
    return detail?.revision ?? null;
  });
  private readonly viewedState = toSignal(
    combineLatest([toObservable(this.detail), toObservable(this.viewed)]).pipe(
      switchMap(([detail, n]) => (detail && n !== null ? this.library.revision(detail.id, n).pipe(toLoadState()) : of<LoadState<RevisionDetail>>({ status: 'loading' }))),
    ),
    { initialValue: { status: 'loading' } as LoadState<RevisionDetail> },
  );
  /** The revision on view; while it reloads (after a sign-off, say) the previous answer for the same number stays. */
  protected readonly viewedRevision = linkedSignal<LoadState<RevisionDetail>, RevisionDetail | null>({
    source: this.viewedState,
    computation: (state, previous) => {
      if (state.status === 'ready') return state.value;
      const kept = previous?.value;
      return state.status === 'loading' && kept && kept.number === this.viewed() ? kept : null;
    },
  });
  protected readonly viewedFailure = computed(() => {
    const state = this.viewedState();
    return state.status === 'failed' ? state.message : null;
  });
  protected readonly viewingNewest = computed(() => this.viewed() !== null && this.viewed() === this.detail()?.revision);

  private readonly commentsState = toSignal(
    combineLatest([toObservable(this.detail), toObservable(this.viewed), toObservable(this.commentReloads)]).pipe(
      switchMap(([detail, n]) => (detail && n !== null ? this.library.comments(detail.id, n).pipe(toLoadState()) : of<LoadState<Comment[]>>({ status: 'loading' }))),
    ),
    { initialValue: { status: 'loading' } as LoadState<Comment[]> },
  );
  protected readonly comments = computed(() => readyValue(this.commentsState()) ?? []);
  private readonly activityState = toSignal(
    combineLatest([toObservable(this.detail), toObservable(this.commentReloads)]).pipe(
      switchMap(([detail]) => (detail ? this.library.activity(detail.id, 1, ACTIVITY_PAGE_SIZE).pipe(toLoadState()) : of<LoadState<ActivityPage>>({ status: 'loading' }))),
    ),
    { initialValue: { status: 'loading' } as LoadState<ActivityPage> },
  );
  protected readonly activity = computed(() => readyValue(this.activityState())?.items ?? []);

  private readonly comparePair = computed((): ComparePair | null => {
    const chosen = this.compareChoice();
    if (chosen.length !== 2) return null;
    const [a, b] = [...chosen].sort((x, y) => x - y);
    return { from: a!, to: b! };
  });
  private readonly diffState = toSignal(
    combineLatest([toObservable(this.detail), toObservable(this.comparePair)]).pipe(
      switchMap(([detail, pair]) =>
        detail && pair
          ? combineLatest([this.library.diff(detail.id, pair.from, pair.to), this.library.revision(detail.id, pair.from), this.library.revision(detail.id, pair.to)]).pipe(
              map(([diff, from, to]) => ({ diff, from, to })),
              toLoadState(),
            )
          : of(null),
      ),
    ),
    { initialValue: null as LoadState<{ diff: RevisionDiff; from: RevisionDetail; to: RevisionDetail }> | null },
  );
  protected readonly comparison = computed(() => {
    const state = this.diffState();
    return state ? readyValue(state) : null;
  });
  protected readonly comparisonFailure = computed(() => {
    const state = this.diffState();
    return state?.status === 'failed' ? state.message : null;
  });

  protected readonly me = this.session.user;
  protected readonly controls = computed(() => {
    const detail = this.detail();
    if (!detail) return null;
    return scenarioControls({
      access: detail.access,
      role: this.session.user()?.role ?? null,
      archived: detail.archivedAt !== null,
      viewingNewest: this.viewingNewest(),
      viewedSignedOff: this.viewedRevision()?.signOff != null,
    });
  });
  protected readonly facts = computed(() => {
    const revision = this.viewedRevision();
    return revision ? readOnlyFacts(revision.scenario) : [];
  });
  protected readonly inputTerms = computed(() => this.viewedRevision()?.scenario.inputs ?? []);
  protected readonly nameText = computed(() => this.nameDraft() ?? this.detail()?.name ?? '');
  protected readonly tagsText = computed(() => this.tagsDraft() ?? this.detail()?.tags.join(', ') ?? '');
  protected readonly caution = SAFETY_CAUTION;
  protected readonly archivedNote = ARCHIVED_SCENARIO_NOTE;
  protected readonly describe = activityText;

  constructor() {
    effect(() => {
      const detail = this.detail();
      if (detail) this.title.setTitle(`${detail.name} · Library · Kinetwin`);
    });
  }

  protected reload(): void {
    this.nameDraft.set(null);
    this.tagsDraft.set(null);
    this.reloads.update((n) => n + 1);
  }

  protected viewRevision(n: number | null): void {
    void this.router.navigate([], { queryParams: { revision: n }, queryParamsHandling: 'merge' });
  }

  protected toggleCompare(n: number): void {
    this.compareChoice.update((chosen) => (chosen.includes(n) ? chosen.filter((c) => c !== n) : [...chosen, n].slice(-2)));
  }

  protected togglePanel(panel: 'hand-off' | 'sign-off'): void {
    this.openPanel.set(this.openPanel() === panel ? null : panel);
  }

  protected closePanel(): void {
    this.openPanel.set(null);
  }

  protected afterSave(detail: LibraryDetail): void {
    this.say(false, `Saved revision ${detail.revision}.`);
    this.viewRevision(null);
    this.reload();
  }

  protected async afterCopy(detail: LibraryDetail): Promise<void> {
    await this.router.navigate(['/library', detail.id]);
    this.say(false, `Your edit was saved as a new scenario, “${detail.name}”.`);
  }

  protected afterHandOff(to: string): void {
    this.closePanel();
    this.say(false, `Handed to ${to}; they get an e-mail.`);
    this.commentReloads.update((n) => n + 1);
  }

  protected afterSignOff(revision: RevisionDetail): void {
    this.closePanel();
    this.say(false, `Revision ${revision.number} is signed off.`);
    this.reload();
  }

  protected afterComment(): void {
    this.commentReloads.update((n) => n + 1);
  }

  protected setNameDraft(text: string): void {
    this.nameDraft.set(text);
  }

  protected setTagsDraft(text: string): void {
    this.tagsDraft.set(text);
  }

  protected async restore(n: number): Promise<void> {
    const detail = this.detail();
    if (!detail) return;
    await this.act(async () => {
      try {
        const restored = await firstValueFrom(this.library.restore(detail.id, n, { baseRevision: detail.revision, note: '' }));
        this.viewRevision(null);
        this.reload();
        return `Revision ${n} restored as revision ${restored.revision}.`;
      } catch (failure) {
        const stale = staleSaveOf(failure);
        if (!stale) throw failure;
        this.reload();
        throw new Error(`${stale.error.message} The page now shows revision ${stale.current.number}.`);
      }
    });
  }

  protected async rename(): Promise<void> {
    const detail = this.detail();
    const name = this.nameText().trim();
    if (!detail || !name || name === detail.name) return;
    await this.act(async () => {
      await firstValueFrom(this.library.patch(detail.id, { name }));
      this.reload();
      return `Renamed to “${name}”.`;
    });
  }

  protected async saveTags(): Promise<void> {
    const detail = this.detail();
    if (!detail) return;
    const tags = this.tagsText()
      .split(',')
      .map((tag) => tag.trim())
      .filter(Boolean);
    await this.act(async () => {
      const saved = await firstValueFrom(this.library.patch(detail.id, { tags }));
      this.reload();
      return saved.tags.length ? `Tags: ${saved.tags.join(', ')}.` : 'Tags cleared.';
    });
  }

  protected async setArchived(archived: boolean): Promise<void> {
    const detail = this.detail();
    if (!detail) return;
    await this.act(async () => {
      await firstValueFrom(this.library.setArchived(detail.id, archived));
      this.reload();
      return archived ? 'Archived: the library hides it until its owner or an admin restores it.' : 'Restored from the archive.';
    });
  }

  protected async duplicate(): Promise<void> {
    const detail = this.detail();
    const n = this.viewed();
    if (!detail || n === null) return;
    await this.act(async () => {
      const copy = await firstValueFrom(this.library.duplicate(detail.id, { revision: n }));
      await this.router.navigate(['/library', copy.id]);
      return `Duplicated revision ${n} as “${copy.name}”.`;
    });
  }

  /** Downloads the revision on view as our scenario file; the caution is shown beside the button. */
  protected async exportRevision(): Promise<void> {
    const detail = this.detail();
    const n = this.viewed();
    if (!detail || n === null) return;
    await this.act(async () => {
      const file = await firstValueFrom(this.library.exportFile(detail.id, n));
      const url = URL.createObjectURL(new Blob([file.text], { type: 'application/json' }));
      const link = document.createElement('a');
      link.href = url;
      link.download = file.fileName;
      link.click();
      URL.revokeObjectURL(url);
      return `Exported ${file.fileName}. ${file.safetyCaution ?? SAFETY_CAUTION}`;
    });
  }

  private async act(action: () => Promise<string>): Promise<void> {
    if (this.busy()) return;
    this.busy.set(true);
    this.actionMessage.set(null);
    try {
      this.say(false, await action());
    } catch (failure) {
      const fields = apiFieldErrors(failure);
      this.say(true, fields.length ? `${apiErrorMessage(failure)} ${fields.map((f) => f.message).join('; ')}` : apiErrorMessage(failure));
    } finally {
      this.busy.set(false);
    }
  }

  private say(error: boolean, text: string): void {
    this.actionMessage.set({ error, text });
  }
}
