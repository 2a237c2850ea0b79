import { HttpErrorResponse } from '@angular/common/http';
import type { ApiErrorBody } from '@kinetwin/shared/protocol/api-types';
import type { FieldError } from '@kinetwin/shared/validation/field-errors';

/** What the user reads when the server cannot be reached at all (HTTP status 0). */
export const UNREACHABLE_SERVER_MESSAGE = 'Cannot reach the Kinetwin server. Check that it is running and try again.';

function isApiErrorBody(body: unknown): body is ApiErrorBody {
  if (body === null || typeof body !== 'object') return false;
  const error = (body as { error?: unknown }).error;
  return error !== null && typeof error === 'object' && typeof (error as { message?: unknown }).message === 'string';
}

/**
 * The sentence to show for a failed API call: the server's own `error.message` when it sent
 * one, otherwise a plain description of the HTTP failure.
 */
export function apiErrorMessage(failure: unknown): string {
  if (failure instanceof HttpErrorResponse) {
    if (isApiErrorBody(failure.error)) return failure.error.error.message;
    if (failure.status === 0) return UNREACHABLE_SERVER_MESSAGE;
    return `The server answered ${failure.status}${failure.statusText ? ` ${failure.statusText}` : ''}.`;
  }
  if (failure instanceof Error) return failure.message;
  return 'Something went wrong.';
}

/** Field errors the server attached to a failed API call, if any. */
export function apiFieldErrors(failure: unknown): FieldError[] {
  if (failure instanceof HttpErrorResponse && isApiErrorBody(failure.error)) return failure.error.error.fields ?? [];
  return [];
}
