import { ChangeDetectionStrategy, Component, input, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatIconModule } from '@angular/material/icon';
import type { ChartActions } from './chart-actions';

/**
 * The app's own chart toolbar, in place of the plotting library's: drag to zoom or to pan, reset
 * the view, save a PNG. Nothing here sends data anywhere; the PNG is drawn in the browser.
 */
@Component({
  selector: 'kt-chart-controls',
  changeDetection: ChangeDetectionStrategy.OnPush,
  imports: [MatButtonModule, MatIconModule],
  host: { 'data-test': 'chart-controls', role: 'toolbar', '[attr.aria-label]': "'Chart controls: ' + chartName()" },
  template: `
    <button mat-icon-button type="button" data-test="chart-zoom" [attr.aria-pressed]="mode() === 'zoom'" title="Drag to zoom" aria-label="Drag to zoom" (click)="drag('zoom')"><mat-icon>zoom_in</mat-icon></button>
    <button mat-icon-button type="button" data-test="chart-pan" [attr.aria-pressed]="mode() === 'pan'" title="Drag to pan" aria-label="Drag to pan" (click)="drag('pan')"><mat-icon>pan_tool</mat-icon></button>
    <button mat-icon-button type="button" data-test="chart-reset" title="Reset the view" aria-label="Reset the view" (click)="actions().reset()"><mat-icon>restart_alt</mat-icon></button>
    <button mat-icon-button type="button" data-test="chart-export-png" title="Save as PNG" aria-label="Save as PNG" (click)="actions().exportPng(fileName())"><mat-icon>image</mat-icon></button>
  `,
  styles: `
    :host { display: flex; justify-content: flex-end; gap: 2px; }
    [aria-pressed='true'] { background: var(--mat-sys-secondary-container); }
  `,
})
export class ChartControls {
  readonly actions = input.required<ChartActions>();
  /** Named in the toolbar's label, e.g. "angle". */
  readonly chartName = input.required<string>();
  /** The PNG's file name without extension. */
  readonly fileName = input.required<string>();

  protected readonly mode = signal<'zoom' | 'pan'>('zoom');

  protected drag(mode: 'zoom' | 'pan'): void {
    this.mode.set(mode);
    void this.actions().dragMode(mode);
  }
}
