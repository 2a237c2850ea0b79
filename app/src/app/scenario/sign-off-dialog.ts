import { ChangeDetectionStrategy, Component, inject, input, output, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatCheckboxModule } from '@angular/material/checkbox';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MAX_REVISION_NOTE_LENGTH, type RevisionDetail, SAFETY_CAUTION } from '@kinetwin/shared/protocol/library-api';
import { firstValueFrom } from 'rxjs';
import { apiErrorMessage } from '../core/api-error-message';
import { LibraryApi } from '../core/library-api';

/**
 * Signs off one revision: shows the safety caution and will not send until the lead ticks that
 * they have read it (the server refuses a sign-off without that acknowledgement as well).
 */
@Component({
  selector: 'kt-sign-off-dialog',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButtonModule, MatCheckboxModule, MatFormFieldModule, MatIconModule, MatInputModule],
  template: `
    <section class="dialog" role="dialog" aria-modal="false" aria-labelledby="sign-off-heading" data-test="sign-off-dialog">
      <h3 id="sign-off-heading">Sign off revision {{ revision() }}</h3>
      <p class="caution" data-test="safety-caution"><mat-icon>warning</mat-icon> {{ caution }}</p>
      <mat-checkbox data-test="acknowledge-safety" [checked]="acknowledged()" (change)="acknowledged.set($event.checked)">
        I have read the caution: these gains still need limited torque and speed, an emergency stop in reach and the applicable codes before they run on hardware.
      </mat-checkbox>
      <mat-form-field appearance="outline" class="wide" subscriptSizing="dynamic">
        <mat-label>Sign-off note (optional)</mat-label>
        <input matInput data-test="sign-off-note" [maxLength]="maxNote" [value]="note()" (input)="note.set($any($event.target).value)" />
      </mat-form-field>
      @if (failure(); as message) {
        <p class="error" role="alert" data-test="sign-off-error">{{ message }}</p>
      }
      <div class="actions">
        <button mat-flat-button type="button" data-test="confirm-sign-off" [disabled]="!acknowledged() || busy()" (click)="signOff()">
          {{ busy() ? 'Signing off…' : 'Sign off' }}
        </button>
        <button mat-button type="button" data-test="cancel-sign-off" (click)="closed.emit()">Cancel</button>
      </div>
    </section>
  `,
  styleUrl: './scenario-dialog.css',
})
export class SignOffDialog {
  private readonly library = inject(LibraryApi);

  readonly scenarioId = input.required<number>();
  readonly revision = input.required<number>();
  readonly signed = output<RevisionDetail>();
  readonly closed = output<void>();

  protected readonly caution = SAFETY_CAUTION;
  protected readonly maxNote = MAX_REVISION_NOTE_LENGTH;
  protected readonly acknowledged = signal(false);
  protected readonly note = signal('');
  protected readonly busy = signal(false);
  protected readonly failure = signal<string | null>(null);

  protected async signOff(): Promise<void> {
    if (!this.acknowledged() || this.busy()) return;
    this.busy.set(true);
    this.failure.set(null);
    try {
      const answer = await firstValueFrom(this.library.signOff(this.scenarioId(), this.revision(), { acknowledgeSafety: true, note: this.note().trim() }));
      this.signed.emit(answer.revision);
    } catch (failure) {
      this.failure.set(apiErrorMessage(failure));
    } finally {
      this.busy.set(false);
    }
  }
}
