import { Injectable, inject, signal } from '@angular/core';
import type { LibraryDetail, StaleSaveBody } from '@kinetwin/shared/protocol/library-api';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import type { FieldError } from '@kinetwin/shared/validation/field-errors';
import { firstValueFrom } from 'rxjs';
import { apiErrorMessage, apiFieldErrors } from '../core/api-error-message';
import { LibraryApi } from '../core/library-api';
import { copyName, staleSaveOf } from './stale-save';

/** One save: the scenario, its note, and the revision the edit started from. */
export interface RevisionSaveRequest {
  scenarioId: number;
  scenario: Scenario;
  note: string;
  baseRevision: number;
}

/**
 * The one way the app saves an edited scenario as a new revision, shared by the bench and the
 * scenario page. A save that started from an older revision comes back 409 with both versions:
 * the flow holds that conflict until the user saves theirs as a copy, reloads, or moves the edit.
 * Provide it per component (each editor has its own conflict and busy state).
 */
@Injectable()
export class RevisionSaveFlow {
  private readonly library = inject(LibraryApi);

  private readonly busyState = signal(false);
  readonly busy = this.busyState.asReadonly();
  private readonly failureText = signal<string | null>(null);
  /** The last failure in words (not a conflict: that is `stale`). */
  readonly failure = this.failureText.asReadonly();
  private readonly fieldFailures = signal<FieldError[]>([]);
  /** Fields the server refused in the last save, for the form to show beside them. */
  readonly fieldErrors = this.fieldFailures.asReadonly();
  private readonly doneText = signal<string | null>(null);
  readonly done = this.doneText.asReadonly();
  private readonly staleBody = signal<StaleSaveBody | null>(null);
  /** The 409 answer while the user has not chosen what to do with the refused edit. */
  readonly stale = this.staleBody.asReadonly();

  /** Saves a revision; the new detail, or null when it failed or conflicted (see the signals). */
  async save(request: RevisionSaveRequest): Promise<LibraryDetail | null> {
    if (this.busyState() || this.staleBody() !== null) return null;
    this.begin();
    try {
      const saved = await firstValueFrom(this.library.save(request.scenarioId, { scenario: request.scenario, note: request.note.trim(), baseRevision: request.baseRevision }));
      this.doneText.set(`Saved as revision ${saved.revision}.`);
      return saved;
    } catch (failure) {
      const stale = staleSaveOf(failure);
      if (stale) {
        this.staleBody.set(stale);
      } else {
        this.failureText.set(apiErrorMessage(failure));
        this.fieldFailures.set(apiFieldErrors(failure));
      }
      return null;
    } finally {
      this.busyState.set(false);
    }
  }

  /** Saves the refused edit as a new scenario of its own (both versions stay); the copy, or null. */
  async saveAsCopy(tags: readonly string[]): Promise<LibraryDetail | null> {
    const stale = this.staleBody();
    if (!stale || this.busyState()) return null;
    return this.attempt(async () => {
      const mine = stale.yours.scenario;
      const note = stale.yours.note || `Copy of an edit of revision ${stale.yours.baseRevision}, saved after revision ${stale.current.number} came in`;
      const created = await firstValueFrom(this.library.create({ scenario: { ...mine, name: copyName(mine.name) }, note, tags: [...tags] }));
      this.staleBody.set(null);
      return created;
    });
  }

  /** Drops the refused edit and fetches the scenario's newest revision; the detail, or null. */
  async loadTheirs(scenarioId: number): Promise<LibraryDetail | null> {
    return this.attempt(async () => {
      const theirs = await firstValueFrom(this.library.get(scenarioId));
      this.staleBody.set(null);
      this.doneText.set(`Showing revision ${theirs.revision}; your edit was dropped.`);
      return theirs;
    });
  }

  /** Ends the conflict without a request (the page reloads, or the edit moves onto theirs). */
  resolve(): void {
    this.staleBody.set(null);
  }

  /** Forgets the last outcome's messages (a new edit was typed). */
  clearMessages(): void {
    this.failureText.set(null);
    this.fieldFailures.set([]);
    this.doneText.set(null);
  }

  private begin(): void {
    this.busyState.set(true);
    this.clearMessages();
  }

  private async attempt(action: () => Promise<LibraryDetail>): Promise<LibraryDetail | null> {
    this.begin();
    try {
      return await action();
    } catch (failure) {
      this.failureText.set(apiErrorMessage(failure));
      return null;
    } finally {
      this.busyState.set(false);
    }
  }
}
