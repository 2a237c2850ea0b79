import { ChangeDetectionStrategy, Component, ElementRef, afterRenderEffect, input, signal, viewChild } from '@angular/core';
import { type Katex, loadKatex } from './katex-loader';
import { stackedLatex } from './stacked-latex';

/**
 * A LaTeX expression typeset by KaTeX into this component's own element (katex.render, no
 * innerHTML binding). Until KaTeX has loaded, or when it cannot, the source text shows instead.
 * throwOnError is off: a construct KaTeX does not know is shown in red, never thrown.
 */
@Component({
  selector: 'kt-katex-expression',
  changeDetection: ChangeDetectionStrategy.OnPush,
  template: `<div #math class="math" [attr.aria-label]="expression()"></div>`,
  styles: `
    :host {
      display: block;
      overflow-x: auto;
    }
  `,
})
export class KatexExpression {
  /** LaTeX source, math mode. */
  readonly expression = input.required<string>();

  private readonly math = viewChild.required<ElementRef<HTMLDivElement>>('math');
  private readonly katex = signal<Katex | null>(null);

  constructor() {
    loadKatex().then(
      (katex) => this.katex.set(katex),
      () => undefined, // the source text stays on show
    );

    afterRenderEffect(() => {
      const element = this.math().nativeElement;
      const expression = this.expression();
      const katex = this.katex();
      if (!katex) {
        element.textContent = expression;
        return;
      }
      // One line per top-level term: display mode never wraps, and a long sum would run off the panel.
      katex.render(stackedLatex(expression), element, { throwOnError: false, displayMode: true, output: 'htmlAndMathml' });
    });
  }
}
