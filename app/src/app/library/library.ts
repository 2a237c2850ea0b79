import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, signal } from '@angular/core';
import { toObservable, toSignal } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatChipsModule } from '@angular/material/chips';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatPaginatorModule, type PageEvent } from '@angular/material/paginator';
import { MatSelectModule } from '@angular/material/select';
import { MatSortModule, type Sort } from '@angular/material/sort';
import { MatTableModule } from '@angular/material/table';
import { Router, RouterLink } from '@angular/router';
import { ARCHIVED_SCENARIO_NOTE } from '@kinetwin/shared/library/archived-scenario';
import { type LibraryPage, SCENARIO_STATUS_LABELS, type TeamMember, scenarioStatuses } from '@kinetwin/shared/protocol/library-api';
import { catchError, debounce, distinctUntilChanged, firstValueFrom, map, of, switchMap, tap, timer } from 'rxjs';
import { apiErrorMessage } from '../core/api-error-message';
import { LibraryApi } from '../core/library-api';
import type { LoadState } from '../core/load-state';
import { Session } from '../core/session';
import { TeamApi } from '../core/team-api';
import { DEFAULT_LIBRARY_VIEW, LIBRARY_PAGE_SIZES, type LibrarySort, type LibraryView, type StatusFilter, libraryQuery } from './library-query';

/** Quiet time after the last keystroke in the search box before the library is asked again, ms. */
export const SEARCH_DEBOUNCE_MS = 250;

/**
 * The team's scenarios: search, filters, sort and pages on the server; each name opens its bench,
 * except an archived one's, which says why it cannot run until restored.
 */
@Component({
  selector: 'kt-library',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [DatePipe, MatButtonModule, MatChipsModule, MatFormFieldModule, MatIconModule, MatInputModule, MatPaginatorModule, MatSelectModule, MatSortModule, MatTableModule, RouterLink],
  templateUrl: './library.html',
  styleUrl: './library.css',
})
export class Library {
  private readonly library = inject(LibraryApi);
  private readonly router = inject(Router);
  private readonly session = inject(Session);

  protected readonly columns = ['name', 'owner', 'status', 'tags', 'updatedAt', 'actions'] as const;
  protected readonly pageSizes = LIBRARY_PAGE_SIZES;
  protected readonly statusLabel: Readonly<Record<string, string>> = SCENARIO_STATUS_LABELS;
  protected readonly statuses = scenarioStatuses;
  protected readonly archivedNote = ARCHIVED_SCENARIO_NOTE;

  private readonly viewState = signal<LibraryView>(DEFAULT_LIBRARY_VIEW);
  protected readonly view = this.viewState.asReadonly();
  /** The search text of the last query sent, to tell typing from other changes. */
  private searchAsked = '';
  private readonly importMessage = signal<{ error: boolean; text: string } | null>(null);
  protected readonly importStatus = this.importMessage.asReadonly();

  /** Typing waits for a pause; every other change of the view asks at once. */
  protected readonly state = toSignal(
    toObservable(this.viewState).pipe(
      debounce((view) => timer(view.search !== this.searchAsked ? SEARCH_DEBOUNCE_MS : 0)),
      tap((view) => (this.searchAsked = view.search)),
      map(libraryQuery),
      distinctUntilChanged((a, b) => JSON.stringify(a) === JSON.stringify(b)),
      switchMap((query) =>
        this.library.list(query).pipe(
          map((value): LoadState<LibraryPage> => ({ status: 'ready', value })),
          catchError((failure: unknown) => of<LoadState<LibraryPage>>({ status: 'failed', message: apiErrorMessage(failure) })),
        ),
      ),
    ),
    { initialValue: { status: 'loading' } as LoadState<LibraryPage> },
  );
  protected readonly owners = toSignal(
    inject(TeamApi)
      .team()
      .pipe(
        map((team) => team.members),
        catchError(() => of<TeamMember[]>([])),
      ),
    { initialValue: [] as TeamMember[] },
  );

  /** The page shown; the previous one stays while the next loads, so the table does not flicker. */
  protected readonly page = computed(() => {
    const state = this.state();
    return state.status === 'ready' ? state.value : null;
  });
  protected readonly scenarios = computed(() => this.page()?.items ?? []);
  protected readonly total = computed(() => this.page()?.total ?? 0);
  protected readonly failure = computed(() => {
    const state = this.state();
    return state.status === 'failed' ? state.message : null;
  });
  protected readonly filtered = computed(() => {
    const view = this.viewState();
    return view.search.trim() !== '' || view.tag.trim() !== '' || view.owner !== null || view.status !== '';
  });
  protected readonly canImport = computed(() => {
    const role = this.session.user()?.role;
    return role !== undefined && role !== 'viewer';
  });

  protected setSearch(search: string): void {
    this.viewState.update((view) => ({ ...view, search, pageIndex: 0 }));
  }

  protected setTag(tag: string): void {
    this.viewState.update((view) => ({ ...view, tag, pageIndex: 0 }));
  }

  protected setOwner(owner: number | null): void {
    this.viewState.update((view) => ({ ...view, owner, pageIndex: 0 }));
  }

  protected setStatus(status: StatusFilter): void {
    this.viewState.update((view) => ({ ...view, status, pageIndex: 0 }));
  }

  protected sortBy(sort: Sort): void {
    // A third click on a header clears MatSort's direction: back to newest first.
    const cleared = sort.direction === '';
    this.viewState.update((view) => ({
      ...view,
      sort: cleared ? 'updatedAt' : (sort.active as LibrarySort),
      order: cleared ? 'desc' : (sort.direction as 'asc' | 'desc'),
      pageIndex: 0,
    }));
  }

  protected turnPage(event: PageEvent): void {
    this.viewState.update((view) => ({ ...view, pageIndex: event.pageIndex, pageSize: event.pageSize }));
  }

  protected clearFilters(): void {
    this.viewState.update((view) => ({ ...DEFAULT_LIBRARY_VIEW, sort: view.sort, order: view.order, pageSize: view.pageSize }));
  }

  /** Reads a scenario file chosen by the user and imports it; the server validates it field by field. */
  protected async importScenario(input: HTMLInputElement): Promise<void> {
    const file = input.files?.[0];
    input.value = '';
    if (!file) return;
    this.importMessage.set(null);
    let parsed: unknown;
    try {
      parsed = JSON.parse(await file.text());
    } catch (failure) {
      this.importMessage.set({ error: true, text: `${file.name} is not JSON (${failure instanceof Error ? failure.message : String(failure)}); nothing was imported.` });
      return;
    }
    try {
      const created = await firstValueFrom(this.library.importFile({ file: parsed }));
      await this.router.navigate(['/library', created.id]);
    } catch (failure) {
      this.importMessage.set({ error: true, text: describeImportFailure(failure) });
    }
  }
}

function describeImportFailure(failure: unknown): string {
  const message = apiErrorMessage(failure);
  const fields = (failure as { error?: { error?: { fields?: { field: string; message: string }[] } } })?.error?.error?.fields ?? [];
  return fields.length ? `${message} ${fields.map((f) => `${f.field}: ${f.message}`).join('; ')}` : message;
}
