/** Characters in the delimiter after `\left`/`\right` at `at`: one (`[`, `(`) or an escaped pair (`\{`). */
function delimiterLength(text: string, at: number): number {
  return text[at] === '\\' ? 2 : 1;
}

/**
 * Puts each top-level term of an equation on its own line, aligned at the `=`, so a response made
 * of several shifted pieces reads down the panel instead of running off its side. Only a ` + ` or
 * ` - ` outside every bracket, brace and `\left … \right` pair after the first top-level `=` starts
 * a line. Anything it cannot read (no `=`, unbalanced brackets, a single term) comes back as it was.
 * @example stackedLatex('x = a + \\left[b + c\\right]u(t)') // '\\begin{aligned}x &= a \\\\ &\\quad + \\left[b + c\\right]u(t)\\end{aligned}'
 */
export function stackedLatex(expression: string): string {
  let depth = 0;
  let equals = -1;
  const cuts: number[] = [];
  for (let i = 0; i < expression.length; i++) {
    if (expression.startsWith('\\left', i) || expression.startsWith('\\right', i)) {
      const word = expression.startsWith('\\left', i) ? 5 : 6;
      depth += word === 5 ? 1 : -1;
      i += word + delimiterLength(expression, i + word) - 1;
      continue;
    }
    const c = expression[i];
    if (c === '\\') {
      i++; // an escaped character such as \{ or \, is never a bracket or an operator
      continue;
    }
    if (c === '{' || c === '(' || c === '[') depth++;
    else if (c === '}' || c === ')' || c === ']') depth--;
    else if (depth === 0 && c === '=' && equals < 0) equals = i;
    else if (depth === 0 && equals >= 0 && (c === '+' || c === '-') && expression[i - 1] === ' ' && expression[i + 1] === ' ') cuts.push(i);
    if (depth < 0) return expression;
  }
  if (depth !== 0 || equals < 0 || cuts.length === 0) return expression;
  const left = expression.slice(0, equals).trim();
  const bounds = [equals + 1, ...cuts, expression.length];
  const lines = bounds.slice(0, -1).map((from, k) => expression.slice(from, bounds[k + 1]).trim());
  return `\\begin{aligned}${left} &= ${lines[0]}${lines
    .slice(1)
    .map((line) => ` \\\\ &\\quad ${line}`)
    .join('')}\\end{aligned}`;
}
