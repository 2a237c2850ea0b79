import { ChangeDetectionStrategy, Component, computed, input, output } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import type { FieldError } from '@kinetwin/shared/validation/field-errors';
import { type ScenarioEdits, fieldText } from './scenario-draft';
import { tuningGroups } from './tuning-fields';

/** One keystroke's worth of edit: the field's dotted path and its whole text. */
export interface FieldEdit {
  path: string;
  text: string;
}

/**
 * Editable quantities of the scenario on the bench. Holds no state: the bench keeps the edits and
 * the validation errors, this form shows them (each error under its field) and reports typing.
 */
@Component({
  selector: 'kt-tuning-form',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButtonModule],
  host: { 'data-test': 'tuning-form' },
  templateUrl: './tuning-form.html',
  styleUrl: './tuning-form.css',
})
export class TuningForm {
  /** The scenario the edits apply to: the stored one, with any kicks the draft kept. */
  readonly saved = input.required<Scenario>();
  readonly edits = input.required<ScenarioEdits>();
  /** Whether the draft differs from the stored scenario beyond the typed edits (kept kicks). */
  readonly otherChanges = input(false);
  /** Errors of the edited scenario; those naming a field show under it. */
  readonly errors = input.required<readonly FieldError[]>();

  readonly edited = output<FieldEdit>();
  readonly resetToSaved = output<void>();

  /** The controller mode the form shows fields for: the edited one once the select changed it. */
  private readonly mode = computed(() => this.edits()['controller.mode'] ?? this.saved().controller.mode);
  // Rebuilt only when the scenario or the mode changes, not on every keystroke.
  protected readonly groups = computed(() => tuningGroups(this.saved(), this.mode()));
  protected readonly hasEdits = computed(() => this.otherChanges() || Object.keys(this.edits()).length > 0);
  private readonly errorsByField = computed(() => {
    const byField = new Map<string, string[]>();
    for (const error of this.errors()) byField.set(error.field, [...(byField.get(error.field) ?? []), error.message]);
    return byField;
  });
  /** Errors about no field on the form (e.g. a reference term left in open loop): listed on top. */
  protected readonly otherErrors = computed(() => {
    const shown = new Set(this.groups().flatMap((group) => group.fields.map((field) => field.path)));
    return this.errors().filter((error) => !shown.has(error.field));
  });

  protected text(path: string): string {
    return fieldText(this.saved(), this.edits(), path);
  }

  protected fieldErrors(path: string): string[] {
    return this.errorsByField().get(path) ?? [];
  }

  protected isEdited(path: string): boolean {
    return this.edits()[path] !== undefined;
  }

  protected editField(path: string, event: Event): void {
    this.edited.emit({ path, text: (event.target as HTMLInputElement | HTMLSelectElement).value });
  }
}
