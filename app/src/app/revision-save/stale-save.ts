import { HttpErrorResponse } from '@angular/common/http';
import type { StaleSaveBody } from '@kinetwin/shared/protocol/library-api';
import { MAX_NAME_LENGTH } from '@kinetwin/shared/scenario/scenario-schema';

/**
 * The server's 409 answer to a save or restore that started from an older revision, or null for
 * any other failure. It carries both versions, so the page can offer a copy or the newer one.
 */
export function staleSaveOf(failure: unknown): StaleSaveBody | null {
  if (!(failure instanceof HttpErrorResponse) || failure.status !== 409) return null;
  const body = failure.error as Partial<StaleSaveBody> | null;
  if (body?.error?.code !== 'stale_revision' || !body.current || !body.yours) return null;
  return body as StaleSaveBody;
}

/**
 * The name of a copy saved from a stale edit, within the scenario name's length limit.
 * @example copyName('Gantry rotary axis') // "Gantry rotary axis (my edit)"
 */
export function copyName(name: string): string {
  const suffix = ' (my edit)';
  return name.slice(0, MAX_NAME_LENGTH - suffix.length) + suffix;
}
