import { ChangeDetectionStrategy, Component, DestroyRef, ElementRef, afterNextRender, effect, inject, input, signal, untracked } from '@angular/core';
import { JointScene, canUseWebGL2 } from './joint-scene';

export const WEBGL_MISSING_MESSAGE = '3D view unavailable: this browser has no WebGL. The chart and numbers still work.';

/** The 3D joint. Loaded with @defer so three.js stays out of the first page's bundle. */
@Component({
  selector: 'kt-joint-view',
  changeDetection: ChangeDetectionStrategy.OnPush,
  host: {
    'data-test': 'joint-view',
    '[attr.data-angle]': 'drawnAngle()',
  },
  template: `
    @if (webglMissing()) {
      <p data-test="webgl-missing" class="webgl-missing">{{ webglMissingMessage }}</p>
    }
  `,
  styleUrl: './joint-view.css',
})
export class JointView {
  private readonly host = inject<ElementRef<HTMLElement>>(ElementRef);

  /** Joint angle to draw, rad. */
  readonly angle = input.required<number>();

  private readonly drawn = signal<number | null>(null);
  protected readonly drawnAngle = this.drawn.asReadonly();
  private readonly missing = signal(false);
  protected readonly webglMissing = this.missing.asReadonly();
  protected readonly webglMissingMessage = WEBGL_MISSING_MESSAGE;

  private joint: JointScene | null = null;

  constructor() {
    const destroyRef = inject(DestroyRef);
    let resizeObserver: ResizeObserver | null = null;

    afterNextRender(() => {
      try {
        if (!canUseWebGL2()) throw new Error('no WebGL2');
        this.joint = new JointScene();
      } catch {
        this.missing.set(true);
        return;
      }
      const host = this.host.nativeElement;
      host.appendChild(this.joint.canvas);
      this.joint.resize(host.clientWidth, host.clientHeight);
      this.draw(untracked(this.angle));
      if (typeof ResizeObserver !== 'undefined') {
        resizeObserver = new ResizeObserver(([entry]) => this.joint?.resize(entry.contentRect.width, entry.contentRect.height));
        resizeObserver.observe(host);
      }
    });

    // Renders only when the angle changes: JointScene.showAngle ignores a repeat.
    effect(() => this.draw(this.angle()));

    destroyRef.onDestroy(() => {
      resizeObserver?.disconnect();
      this.joint?.dispose();
      this.joint = null;
    });
  }

  private draw(angle: number): void {
    if (!this.joint || !Number.isFinite(angle)) return;
    if (this.joint.showAngle(angle)) this.drawn.set(angle);
  }
}
