import { stackedLatex } from './stacked-latex';

describe('stackedLatex', () => {
  it('starts a line at each top-level + or − after the =, aligned at the =', () => {
    const expression = String.raw`\theta(t) = \left[-0.05 + 0.07\,e^{-8.3(t - 0.5)}\right]u(t - 0.5) + \left[0.03\,e^{-8.3(t - 1.5)}\right]u(t - 1.5) - 0.2\,u(t)`;
    expect(stackedLatex(expression)).toBe(
      String.raw`\begin{aligned}\theta(t) &= \left[-0.05 + 0.07\,e^{-8.3(t - 0.5)}\right]u(t - 0.5) \\ &\quad + \left[0.03\,e^{-8.3(t - 1.5)}\right]u(t - 1.5) \\ &\quad - 0.2\,u(t)\end{aligned}`,
    );
  });

  it('never cuts inside brackets, braces, parentheses or an escaped delimiter pair', () => {
    const expression = String.raw`y = \left\{a + b\right\} + e^{c - d}\,(f - g)`;
    expect(stackedLatex(expression)).toBe(String.raw`\begin{aligned}y &= \left\{a + b\right\} \\ &\quad + e^{c - d}\,(f - g)\end{aligned}`);
  });

  it('leaves a single term, an expression without = and unbalanced input as they were', () => {
    for (const expression of [String.raw`\theta(t) = \left[0.5 + e^{-t}\right]u(t)`, 'a + b', String.raw`x = \left[a + b + c`, 'x = a) + (b']) {
      expect(stackedLatex(expression)).toBe(expression);
    }
  });
});
