import { evaluateUniformGrid, gridPointCount, MAX_GRID_POINTS } from '../../shared/closed-form/index';
import { type Parsed } from '../../shared/validation/field-errors';
import { closedFormReport } from './closed-form-report';
import { type SolvedScenario } from './response-sources';

/** Grid rows formatted per output chunk: large enough to write fast, small enough to stream. */
export const ROWS_PER_CHUNK = 4096;

/**
 * The output of `kinetwin response` as a sequence of text chunks (so a long grid streams
 * instead of building one huge string). Refuses a grid over MAX_GRID_POINTS, naming --dt.
 * @param dt grid spacing, s
 * @example [...responseChunks(solved, 0.5, 'csv', 1)].join('') // "t,angle,velocity\n0,0,0\n0.5,…\n1,…\n"
 */
export function responseChunks(solved: SolvedScenario, dt: number, format: 'csv' | 'json', horizon: number): Parsed<Iterable<string>> {
  const n = gridPointCount(horizon, dt);
  if (n > MAX_GRID_POINTS) {
    return { ok: false, errors: [{ field: '--dt', message: `--dt ${dt} s gives ${n} points over the ${horizon} s horizon; at most ${MAX_GRID_POINTS} are allowed` }] };
  }
  const angle = new Float64Array(n);
  const velocity = new Float64Array(n);
  evaluateUniformGrid(solved.closedForm.plan, dt, n, angle, velocity);
  return { ok: true, value: format === 'csv' ? csvChunks(n, dt, angle, velocity) : jsonChunks(solved, n, dt, angle, velocity) };
}

function* csvChunks(n: number, dt: number, angle: Float64Array, velocity: Float64Array): Generator<string> {
  yield 't,angle,velocity\n';
  for (let start = 0; start < n; start += ROWS_PER_CHUNK) {
    const end = Math.min(n, start + ROWS_PER_CHUNK);
    const lines: string[] = [];
    for (let i = start; i < end; i++) lines.push(`${num(i * dt)},${num(angle[i]!)},${num(velocity[i]!)}`);
    yield `${lines.join('\n')}\n`;
  }
}

function* jsonChunks(solved: SolvedScenario, n: number, dt: number, angle: Float64Array, velocity: Float64Array): Generator<string> {
  const head = {
    ...closedFormReport(solved.closedForm),
    dt,
    terms: solved.closedForm.terms,
    velocityTerms: solved.closedForm.velocityTerms,
    latex: solved.closedForm.latex,
  };
  yield `${JSON.stringify(head).slice(0, -1)},"t":[`;
  yield* numberList(n, (i) => i * dt);
  yield '],"angle":[';
  yield* numberList(n, (i) => angle[i]!);
  yield '],"velocity":[';
  yield* numberList(n, (i) => velocity[i]!);
  yield ']}\n';
}

function* numberList(n: number, at: (i: number) => number): Generator<string> {
  for (let start = 0; start < n; start += ROWS_PER_CHUNK) {
    const end = Math.min(n, start + ROWS_PER_CHUNK);
    const parts: string[] = [];
    for (let i = start; i < end; i++) parts.push(num(at(i)));
    yield (start > 0 ? ',' : '') + parts.join(',');
  }
}

/** Shortest text that reads back as the same double (what JSON.stringify writes); −0 as 0. */
function num(x: number): string {
  return x === 0 ? '0' : String(x);
}
