import { ChangeDetectionStrategy, Component, computed, input, output, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import type { RunKickRequest } from '@kinetwin/shared/protocol/run-events';
import type { FieldError } from '@kinetwin/shared/validation/field-errors';
import { DECIMAL } from '@kinetwin/shared/scenario/field-edits';

/** A kick as the bench asks the server for it. */
export type KickRequest = RunKickRequest['kick'];

/** One kick the run took, in words, with a stable id for `track`. */
export interface KickEntry {
  id: number;
  text: string;
}

/**
 * Kicks a live run: a torque impulse or step, or (closed loop only) a reference step, of the
 * amplitude typed. The amplitude can be set before Run; only the buttons wait for a live run. Holds only the amplitude text; the bench sends the kick and lists what the run
 * took. The amplitude's unit follows the button: N·m·s, N·m or rad.
 */
@Component({
  selector: 'kt-kick-panel',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButtonModule],
  host: { 'data-test': 'kick-panel' },
  template: `
    <h2>Kick the joint</h2>
    <div class="kick-row">
      <label for="kick-amplitude">Amplitude</label>
      <input
        id="kick-amplitude"
        name="kick.amplitude"
        inputmode="decimal"
        autocomplete="off"
        [value]="amplitude()"
        (input)="typeAmplitude($event)"
      />
      <button mat-stroked-button type="button" data-test="kick-torque-impulse" [disabled]="!enabled()" (click)="kick('torque', 'impulse')">Torque impulse (N·m·s)</button>
      <button mat-stroked-button type="button" data-test="kick-torque-step" [disabled]="!enabled()" (click)="kick('torque', 'step')">Torque step (N·m)</button>
      @if (closedLoop()) {
        <button mat-stroked-button type="button" data-test="kick-reference-step" [disabled]="!enabled()" (click)="kick('reference', 'step')">Reference step (rad)</button>
      }
    </div>
    @if (!enabled()) {
      <p class="note">Set the amplitude now; the kick buttons act on a live run, once you press Run.</p>
    }
    @if (shownErrors().length > 0) {
      <ul data-test="kick-errors" class="errors" aria-live="polite">
        @for (error of shownErrors(); track $index) {
          <li>
            @if (error.field) {
              <code>{{ error.field }}</code>:
            }
            {{ error.message }}
          </li>
        }
      </ul>
    }
    @if (kicks().length > 0) {
      <ol data-test="kick-list" class="kick-list">
        @for (entry of kicks(); track entry.id) {
          <li class="numeric">{{ entry.text }}</li>
        }
      </ol>
      @if (keepable()) {
        <button mat-stroked-button type="button" data-test="keep-kicks" (click)="keep.emit()">Keep as forcing terms of the draft</button>
        <p class="note">Adds these kicks to the scenario's inputs at the times they landed; the next run and a saved revision carry them.</p>
      }
    }
  `,
  styleUrls: ['./bench-panel.css', './kick-panel.css'],
})
export class KickPanel {
  /** Whether a run is live, so a kick can land. */
  readonly enabled = input.required<boolean>();
  /** Whether the scenario has a PID loop, so a reference step means something. */
  readonly closedLoop = input.required<boolean>();
  /** The kicks this run took, oldest first. */
  readonly kicks = input.required<readonly KickEntry[]>();
  /** What the server refused about the last kick. */
  readonly errors = input<readonly FieldError[]>([]);
  /** Whether the kicks listed may join the draft as forcing terms (the run is over). */
  readonly keepable = input(false);
  readonly kicked = output<KickRequest>();
  /** Keep the listed kicks as forcing terms of the draft. */
  readonly keep = output<void>();

  private readonly amplitudeText = signal('0.01');
  protected readonly amplitude = this.amplitudeText.asReadonly();
  private readonly amplitudeError = signal<FieldError | null>(null);
  protected readonly shownErrors = computed(() => {
    const local = this.amplitudeError();
    return local ? [local] : this.errors();
  });

  protected typeAmplitude(event: Event): void {
    this.amplitudeText.set((event.target as HTMLInputElement).value);
    this.amplitudeError.set(null);
  }

  /** Asks for a kick of the typed amplitude, or says why the text is not one. */
  protected kick(channel: KickRequest['channel'], shape: KickRequest['shape']): void {
    const text = this.amplitudeText().trim();
    if (text === '') {
      this.amplitudeError.set({ field: 'kick.amplitude', message: 'amplitude is required' });
      return;
    }
    const amplitude = Number(text);
    if (!DECIMAL.test(text) || !Number.isFinite(amplitude)) {
      this.amplitudeError.set({ field: 'kick.amplitude', message: `amplitude must be a finite number, got "${this.amplitudeText()}"` });
      return;
    }
    this.amplitudeError.set(null);
    this.kicked.emit({ channel, shape, amplitude });
  }
}
