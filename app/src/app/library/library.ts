import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { MatTableModule } from '@angular/material/table';
import { RouterLink } from '@angular/router';
import type { ScenarioSummary } from '@kinetwin/shared/protocol/api-types';
import { catchError, map, of } from 'rxjs';
import { apiErrorMessage } from '../core/api-error-message';
import type { LoadState } from '../core/load-state';
import { ScenarioApi } from '../core/scenario-api';

/** The team's scenarios; each name opens its bench. */
@Component({
  selector: 'kt-library',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [DatePipe, MatTableModule, RouterLink],
  templateUrl: './library.html',
  styleUrl: './library.css',
})
export class Library {
  protected readonly columns = ['name', 'owner', 'updated'] as const;

  protected readonly state = toSignal(
    inject(ScenarioApi)
      .list()
      .pipe(
        map((value): LoadState<ScenarioSummary[]> => ({ status: 'ready', value })),
        catchError((failure: unknown) => of<LoadState<ScenarioSummary[]>>({ status: 'failed', message: apiErrorMessage(failure) })),
      ),
    { initialValue: { status: 'loading' } as LoadState<ScenarioSummary[]> },
  );
  protected readonly scenarios = computed(() => {
    const state = this.state();
    return state.status === 'ready' ? state.value : [];
  });
  protected readonly failure = computed(() => {
    const state = this.state();
    return state.status === 'failed' ? state.message : null;
  });
}
