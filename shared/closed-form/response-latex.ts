import { type ResponseTerm } from './response-terms';

/** Significant digits of the numbers in the LaTeX form (display only; the terms keep full precision). */
export const LATEX_DIGITS = 4;

/**
 * The closed form as a LaTeX string for KaTeX: terms grouped by their start time, each group
 * multiplied by u(t − a). `symbol` is the left-hand side, e.g. "\\theta(t)".
 * @example responseLatex(terms, '\\theta(t)') // "\\theta(t) = \\left[0.5 - 0.5\\,e^{-2t}\\right]u(t)"
 */
export function responseLatex(terms: readonly ResponseTerm[], symbol: string): string {
  const delays = [...new Set(terms.map((t) => t.delay))].sort((a, b) => a - b);
  const groups: string[] = [];
  for (const a of delays) {
    const tau = a === 0 ? 't' : `(t - ${formatNumber(a)})`;
    const parts = mergeLikeTerms(terms.filter((t) => t.delay === a)).map((t) => termLatex(t, tau));
    const body = joinSigned(parts);
    if (body === '') continue;
    groups.push(`\\left[${body}\\right]u${a === 0 ? '(t)' : tau}`);
  }
  return `${symbol} = ${groups.length === 0 ? '0' : joinSigned(groups.map((g) => ({ sign: 1, text: g })))}`;
}

/** Sums terms of one start time that share kind, pole and power (pieces from different sources), for a shorter formula. */
function mergeLikeTerms(terms: readonly ResponseTerm[]): ResponseTerm[] {
  const byKey = new Map<string, ResponseTerm>();
  for (const t of terms) {
    const key = t.kind === 'impulse' ? `i:${t.order}` : `${t.kind}:${t.pole.re}:${t.pole.im}:${t.power}`;
    const seen = byKey.get(key);
    if (!seen) byKey.set(key, { ...t });
    else if (seen.kind === 'oscillation' && t.kind === 'oscillation') {
      seen.cosCoefficient += t.cosCoefficient;
      seen.sinCoefficient += t.sinCoefficient;
    } else if (seen.kind !== 'oscillation' && t.kind !== 'oscillation') seen.coefficient += t.coefficient;
  }
  return [...byKey.values()];
}

interface Signed {
  sign: 1 | -1;
  text: string;
}

function joinSigned(parts: readonly Signed[]): string {
  return parts
    .filter((p) => p.text !== '')
    .map((p, i) => (i === 0 ? (p.sign < 0 ? `-${p.text}` : p.text) : `${p.sign < 0 ? ' - ' : ' + '}${p.text}`))
    .join('');
}

function termLatex(term: ResponseTerm, tau: string): Signed {
  if (term.kind === 'impulse') {
    const mark = term.order === 0 ? '\\delta' : term.order === 1 ? "\\delta'" : `\\delta^{(${term.order})}`;
    const arg = tau === 't' ? '(t)' : tau;
    return scaled(term.coefficient, `${mark}${arg}`);
  }
  const power = term.power === 0 ? '' : term.power === 1 ? tau : `${tau}^{${term.power}}`;
  const exp = term.pole.re === 0 ? '' : `e^{${formatNumber(term.pole.re)}${tau === 't' ? 't' : tau}}`;
  const factor = [power, exp].filter(Boolean).join('\\,');
  if (term.kind === 'exponential') return scaled(term.coefficient, factor);
  const w = formatNumber(term.pole.im);
  const arg = tau === 't' ? `${w}t` : `${w}${tau}`;
  const trig = joinSigned([
    { ...signedNumber(term.cosCoefficient), text: term.cosCoefficient === 0 ? '' : `${unitless(term.cosCoefficient)}\\cos(${arg})` },
    { ...signedNumber(term.sinCoefficient), text: term.sinCoefficient === 0 ? '' : `${unitless(term.sinCoefficient)}\\sin(${arg})` },
  ]);
  return { sign: 1, text: `${factor}${factor ? '\\,' : ''}\\left(${trig}\\right)` };
}

/** |x| as a factor: a coefficient of magnitude 1 is written as nothing. */
function unitless(x: number): string {
  const mag = formatNumber(Math.abs(x));
  return mag === '1' ? '' : `${mag}\\,`;
}

function signedNumber(x: number): { sign: 1 | -1 } {
  return { sign: x < 0 ? -1 : 1 };
}

function scaled(coefficient: number, factor: string): Signed {
  const mag = formatNumber(Math.abs(coefficient));
  if (factor === '') return { sign: coefficient < 0 ? -1 : 1, text: mag };
  return { sign: coefficient < 0 ? -1 : 1, text: mag === '1' ? factor : `${mag}\\,${factor}` };
}

/** A number in LaTeX with LATEX_DIGITS significant digits; powers of ten as \cdot 10^{k}. */
export function formatNumber(x: number): string {
  if (x === 0) return '0';
  const text = Number(x.toPrecision(LATEX_DIGITS)).toString();
  const m = /^(-?[\d.]+)e([+-]\d+)$/.exec(text);
  return m ? `${m[1]}\\cdot 10^{${Number(m[2])}}` : text;
}
