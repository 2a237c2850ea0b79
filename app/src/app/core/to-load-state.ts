import { type Observable, type OperatorFunction, catchError, map, of, startWith } from 'rxjs';
import { apiErrorMessage } from './api-error-message';
import type { LoadState } from './load-state';

/** A request as a LoadState stream: loading first, then the value or the failure's sentence. */
export function toLoadState<T>(): OperatorFunction<T, LoadState<T>> {
  return (source: Observable<T>) =>
    source.pipe(
      map((value): LoadState<T> => ({ status: 'ready', value })),
      catchError((failure: unknown) => of<LoadState<T>>({ status: 'failed', message: apiErrorMessage(failure) })),
      startWith<LoadState<T>>({ status: 'loading' }),
    );
}

/** The value of a LoadState, or null while loading or after a failure. */
export function readyValue<T>(state: LoadState<T>): T | null {
  return state.status === 'ready' ? state.value : null;
}
