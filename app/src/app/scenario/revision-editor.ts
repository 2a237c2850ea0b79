import { ChangeDetectionStrategy, Component, computed, effect, inject, input, output, signal, untracked } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { type LibraryDetail, MAX_REVISION_NOTE_LENGTH } from '@kinetwin/shared/protocol/library-api';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import type { FieldError } from '@kinetwin/shared/validation/field-errors';
import { type FieldEdits, applyFieldEdits, effectiveFieldEdits, fieldValueText } from '@kinetwin/shared/scenario/field-edits';
import { parameterApplies } from '@kinetwin/shared/scenario/choice-parameters';
import { EDITABLE_PARAMETERS } from './parameter-edits';
import { RevisionSaveFlow } from '../revision-save/revision-save-flow';
import { StaleSaveNotice } from '../revision-save/stale-save-notice';

/** The revision an edit starts from: its number (sent as baseRevision) and its document. */
interface EditBase {
  revision: number;
  scenario: Scenario;
}

/**
 * Edits the newest revision's parameters and saves them as a new revision. A save that started
 * from an older revision comes back 409 with both versions; then the editor offers to save the
 * edit as a copy, to keep the edit on top of the newer revision, or to drop it and load theirs
 * (RevisionSaveFlow, the bench's save flow too).
 */
@Component({
  selector: 'kt-revision-editor',
  changeDetection: ChangeDetectionStrategy.OnPush,
  providers: [RevisionSaveFlow],
  imports: [MatButtonModule, MatFormFieldModule, MatIconModule, MatInputModule, StaleSaveNotice],
  templateUrl: './revision-editor.html',
  styleUrl: './revision-editor.css',
})
export class RevisionEditor {
  protected readonly flow = inject(RevisionSaveFlow);

  /** The scenario as the server last sent it; a new value (after a save or reload) restarts the edit. */
  readonly detail = input.required<LibraryDetail>();
  /** A new revision was saved. */
  readonly saved = output<LibraryDetail>();
  /** The edit was saved as a new scenario instead. */
  readonly copied = output<LibraryDetail>();
  /** The user dropped the edit to see the newer revision: the page should load it. */
  readonly reloadRequested = output<void>();

  protected readonly maxNote = MAX_REVISION_NOTE_LENGTH;

  private readonly editBase = signal<EditBase | null>(null);
  private readonly editTexts = signal<FieldEdits>({});
  protected readonly edits = this.editTexts.asReadonly();
  private readonly noteText = signal('');
  protected readonly note = this.noteText.asReadonly();
  protected readonly saving = this.flow.busy;
  protected readonly failure = this.flow.failure;
  protected readonly stale = this.flow.stale;
  protected readonly done = this.flow.done;

  protected readonly base = this.editBase.asReadonly();
  /** The fields the base's controller mode uses: an open loop offers no gains. */
  protected readonly parameters = computed(() => {
    const mode = this.editBase()?.scenario.controller.mode ?? 'pid';
    return EDITABLE_PARAMETERS.filter((parameter) => parameterApplies(parameter.path, mode));
  });
  private readonly pending = computed(() => {
    const base = this.editBase();
    return base ? effectiveFieldEdits(base.scenario, this.editTexts()) : {};
  });
  protected readonly changed = computed(() => Object.keys(this.pending()).length > 0);
  private readonly result = computed(() => {
    const base = this.editBase();
    return base ? applyFieldEdits(base.scenario, this.pending()) : null;
  });
  protected readonly errors = computed((): FieldError[] => {
    const result = this.result();
    return [...(result && !result.ok ? result.errors : []), ...this.flow.fieldErrors()];
  });
  protected readonly canSave = computed(() => this.changed() && this.result()?.ok === true && !this.saving() && this.stale() === null);

  /** Set by "keep my edit on theirs": the next detail only moves the base, the edits stay. */
  private keepEditsOnNextDetail = false;

  constructor() {
    effect(() => {
      const detail = this.detail();
      untracked(() => {
        this.editBase.set({ revision: detail.revision, scenario: detail.scenario });
        if (this.keepEditsOnNextDetail) {
          this.keepEditsOnNextDetail = false;
          return;
        }
        this.editTexts.set({});
        this.noteText.set('');
        this.flow.resolve();
      });
    });
  }

  protected text(path: string): string {
    const edit = this.editTexts()[path];
    if (edit !== undefined) return edit;
    const base = this.editBase();
    return base ? fieldValueText(base.scenario, path) : '';
  }

  protected errorOf(path: string): string | null {
    return this.errors().find((error) => error.field === path || error.field === `scenario.${path}`)?.message ?? null;
  }

  protected edit(path: string, text: string): void {
    this.editTexts.update((edits) => ({ ...edits, [path]: text }));
    this.flow.clearMessages();
  }

  protected setNote(text: string): void {
    this.noteText.set(text);
  }

  protected discardEdits(): void {
    this.editTexts.set({});
    this.flow.clearMessages();
  }

  protected async saveRevision(): Promise<void> {
    const base = this.editBase();
    const result = this.result();
    if (!base || !result?.ok || !this.canSave()) return;
    const detail = await this.flow.save({ scenarioId: this.detail().id, scenario: result.value, note: this.noteText(), baseRevision: base.revision });
    if (detail) this.saved.emit(detail);
  }

  /** Saves the refused edit as a new scenario of its own: both versions stay. */
  protected async saveAsCopy(): Promise<void> {
    const created = await this.flow.saveAsCopy(this.detail().tags);
    if (!created) return;
    this.editTexts.set({});
    this.copied.emit(created);
  }

  /** Moves the edit onto the newer revision: untouched fields take its values, edited ones keep mine. */
  protected keepMineOnTheirs(): void {
    const stale = this.stale();
    if (!stale) return;
    this.editBase.set({ revision: stale.current.number, scenario: stale.current.scenario });
    this.flow.resolve();
    this.keepEditsOnNextDetail = true;
    this.reloadRequested.emit();
  }

  /** Drops the edit and loads the newer revision. */
  protected reloadTheirs(): void {
    this.flow.resolve();
    this.editTexts.set({});
    this.reloadRequested.emit();
  }
}
