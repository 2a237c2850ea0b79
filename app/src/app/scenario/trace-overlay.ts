import { ChangeDetectionStrategy, Component, computed, effect, input, signal } from '@angular/core';
import type { Scenario } from '@kinetwin/shared/scenario/scenario-schema';
import { closedFormTraces } from './closed-form-traces';
import { type AngleTrace, scaleTraces } from './trace-scale';

const WIDTH = 640;
const HEIGHT = 220;

type OverlayState = { kind: 'loading' } | { kind: 'failed'; message: string } | { kind: 'ready'; traces: AngleTrace[] };

/** The closed-form angle traces of two revisions on shared axes: "from" dashed, "to" solid. */
@Component({
  selector: 'kt-trace-overlay',
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `
    @switch (state().kind) {
      @case ('loading') {
        <p class="note">Solving both revisions in closed form…</p>
      }
      @case ('failed') {
        <p class="note" data-test="overlay-error">{{ failure() }}</p>
      }
      @case ('ready') {
        <figure data-test="trace-overlay" [attr.data-traces]="scaled()?.paths?.length">
          <svg [attr.viewBox]="'0 0 ' + width + ' ' + height" role="img" [attr.aria-label]="caption()">
            <rect x="0" y="0" [attr.width]="width" [attr.height]="height" class="frame" />
            <path [attr.d]="scaled()?.paths?.[0]" class="from" data-test="overlay-from" />
            <path [attr.d]="scaled()?.paths?.[1]" class="to" data-test="overlay-to" />
          </svg>
          <figcaption>
            <span class="key from-key">— — revision {{ fromLabel() }}</span>
            <span class="key to-key">—— revision {{ toLabel() }}</span>
            <span class="numeric">θ from {{ scaled()?.angleMin?.toPrecision(3) }} to {{ scaled()?.angleMax?.toPrecision(3) }} rad, t from 0 to {{ scaled()?.tMax }} s</span>
          </figcaption>
        </figure>
      }
    }
  `,
  styles: `
    figure { margin: 8px 0; }
    svg { width: 100%; max-width: 640px; height: auto; display: block; }
    .frame { fill: var(--mat-sys-surface-container-lowest); stroke: var(--mat-sys-outline-variant); }
    path { fill: none; stroke-width: 1.6; vector-effect: non-scaling-stroke; }
    .from { stroke: var(--mat-sys-outline); stroke-dasharray: 6 4; }
    .to { stroke: var(--mat-sys-primary); }
    figcaption { display: flex; flex-wrap: wrap; gap: 12px; font: var(--mat-sys-body-small); color: var(--mat-sys-on-surface-variant); }
    .to-key { color: var(--mat-sys-primary); }
    .note { color: var(--mat-sys-on-surface-variant); }
  `,
})
export class TraceOverlay {
  readonly from = input.required<Scenario>();
  readonly to = input.required<Scenario>();
  readonly fromLabel = input.required<number>();
  readonly toLabel = input.required<number>();

  protected readonly width = WIDTH;
  protected readonly height = HEIGHT;
  private readonly overlay = signal<OverlayState>({ kind: 'loading' });
  protected readonly state = this.overlay.asReadonly();
  protected readonly failure = computed(() => {
    const state = this.overlay();
    return state.kind === 'failed' ? state.message : '';
  });
  protected readonly scaled = computed(() => {
    const state = this.overlay();
    return state.kind === 'ready' ? scaleTraces(state.traces, WIDTH, HEIGHT) : null;
  });
  protected readonly caption = computed(() => `Closed-form angle of revision ${this.fromLabel()} (dashed) and revision ${this.toLabel()} (solid)`);

  /** Counts requests so an answer for an older pair never replaces a newer one. */
  private request = 0;

  constructor() {
    effect(() => {
      const pair = [this.from(), this.to()];
      const mine = ++this.request;
      this.overlay.set({ kind: 'loading' });
      closedFormTraces(pair).then(
        (results) => {
          if (mine !== this.request) return;
          const refused = results.findIndex((result) => !result.ok);
          if (refused >= 0) {
            const result = results[refused]!;
            const reason = result.ok ? '' : (result.errors[0]?.message ?? 'no closed form');
            this.overlay.set({ kind: 'failed', message: `No overlay: revision ${refused === 0 ? this.fromLabel() : this.toLabel()} has no closed form here (${reason}).` });
            return;
          }
          this.overlay.set({ kind: 'ready', traces: results.map((result) => (result as { value: AngleTrace }).value) });
        },
        (failure: unknown) => {
          if (mine === this.request) this.overlay.set({ kind: 'failed', message: `No overlay: the closed-form engine could not be loaded (${failure instanceof Error ? failure.message : String(failure)}).` });
        },
      );
    });
  }
}
