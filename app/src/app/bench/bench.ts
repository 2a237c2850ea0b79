import { ChangeDetectionStrategy, Component, computed, effect, inject, input, untracked } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import { MatSliderModule } from '@angular/material/slider';
import { Title } from '@angular/platform-browser';
import { Router, RouterLink } from '@angular/router';
import type { LibraryDetail } from '@kinetwin/shared/protocol/library-api';
import { RunSocket } from '../core/run-socket';
import { AngleChart } from './angle-chart';
import { BenchClosedForm } from './bench-closed-form';
import { BenchDraft } from './bench-draft';
import { BenchLiveRun, SPEED_CHOICES } from './bench-live-run';
import { ChecksPanel } from './checks-panel';
import { ClosedFormPanel } from './closed-form-panel';
import { FrequencyPanel } from './frequency-panel';
import { JointView } from './joint-view';
import { KickPanel } from './kick-panel';
import { LinearizePanel } from './linearize-panel';
import { RootLocusPanel } from './root-locus-panel';
import { SaveRevisionPanel } from './save-revision-panel';
import { formatQuantity, formatResult } from './scenario-facts';
import { type FieldEdit, TuningForm } from './tuning-form';

/**
 * One scenario on the bench: its quantities and their unsaved draft (BenchDraft), the live twin
 * in 3D and on the angle chart (BenchLiveRun), the closed form over it (BenchClosedForm), the
 * checks, frequency, root-locus and linearize panels. The component only wires them to the template.
 */
@Component({
  selector: 'kt-bench',
  changeDetection: ChangeDetectionStrategy.OnPush,
  providers: [RunSocket, BenchDraft, BenchLiveRun, BenchClosedForm],
  imports: [AngleChart, ChecksPanel, ClosedFormPanel, FrequencyPanel, JointView, KickPanel, LinearizePanel, MatButtonModule, MatIconModule, MatSliderModule, RootLocusPanel, RouterLink, SaveRevisionPanel, TuningForm],
  templateUrl: './bench.html',
  styleUrl: './bench.css',
})
export class Bench {
  protected readonly draft = inject(BenchDraft);
  protected readonly run = inject(BenchLiveRun);
  protected readonly closedForm = inject(BenchClosedForm);
  private readonly title = inject(Title);
  private readonly router = inject(Router);

  /** Scenario id from the route (`/bench/:id`). */
  readonly id = input.required<string>();

  protected readonly speedChoices = SPEED_CHOICES;
  protected readonly scrubLabel = (time: number): string => `${time.toFixed(2)} s`;
  protected readonly residualText = computed(() => {
    const residual = this.run.residual();
    if (residual.kind !== 'measured') return residual.kind === 'unavailable' ? residual.message : '';
    const { peak } = residual;
    return `Last run: max |twin − closed form| = ${formatResult(peak.maxAbs, 'rad')} at t = ${formatQuantity(peak.time, 's')} (${peak.samples} twin samples${residual.inline ? ', edited scenario' : ''})`;
  });

  constructor() {
    effect(() => {
      const id = this.id();
      untracked(() => this.draft.open(id));
    });
    effect(() => {
      const detail = this.draft.detail();
      if (detail) this.title.setTitle(`${detail.name} · Bench · Kinetwin`);
    });
  }

  protected editField(edit: FieldEdit): void {
    this.draft.edit(edit.path, edit.text);
  }

  protected showRevision(detail: LibraryDetail): void {
    this.draft.showRevision(detail);
  }

  /** The edit went into a new scenario: open that one on the bench. */
  protected async openCopy(detail: LibraryDetail): Promise<void> {
    this.draft.dropRevision();
    await this.router.navigate(['/bench', detail.id]);
  }

  protected chooseSpeed(event: Event): void {
    this.run.chooseSpeed(Number((event.target as HTMLSelectElement).value));
  }
}
