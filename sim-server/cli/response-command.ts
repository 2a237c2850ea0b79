import { evaluateUniformGrid, gridPointCount, MAX_GRID_POINTS } from '../../shared/closed-form/index';
import { type Parsed } from '../../shared/validation/field-errors';
import { closedFormReport } from './closed-form-report';
import { type SolvedScenario } from './response-sources';

/** Grid rows formatted per output chunk: large enough to write fast, small enough to stream. */
export const ROWS_PER_CHUNK = 4096;

/** One output column: its header name and its values, row by row. */
interface Column {
  name: string;
  at: (i: number) => number;
}

/** Refuses a grid over MAX_GRID_POINTS before anything is computed on it, naming --dt. */
export function checkGridSize(dt: number, horizon: number): Parsed<number> {
  const n = gridPointCount(horizon, dt);
  if (n > MAX_GRID_POINTS) {
    return { ok: false, errors: [{ field: '--dt', message: `--dt ${dt} s gives ${n} points over the ${horizon} s horizon; at most ${MAX_GRID_POINTS} are allowed` }] };
  }
  return { ok: true, value: n };
}

/**
 * The output of `kinetwin response` as a sequence of text chunks (so a long grid streams
 * instead of building one huge string). Columns by method — closed-form: t,angle,velocity;
 * sim: t,angle,velocity of the twin; both: t,angle,velocity,twinAngle,twinVelocity,residual
 * (residual = twin − closed form, rad). A twin run stopped at a bound ends the rows there.
 * @param dt grid spacing, s
 * @example [...responseChunks(solved, 0.5, 'csv', 1).value].join('') // "t,angle,velocity\n0,0,0\n0.5,…\n1,…\n"
 */
export function responseChunks(solved: SolvedScenario, dt: number, format: 'csv' | 'json', horizon: number): Parsed<Iterable<string>> {
  const grid = checkGridSize(dt, horizon);
  if (!grid.ok) return grid;
  let n = grid.value;
  const columns: Column[] = [{ name: 't', at: (i) => i * dt }];
  if (solved.closedForm) {
    const angle = new Float64Array(n);
    const velocity = new Float64Array(n);
    evaluateUniformGrid(solved.closedForm.plan, dt, n, angle, velocity);
    columns.push({ name: 'angle', at: (i) => angle[i]! }, { name: 'velocity', at: (i) => velocity[i]! });
    if (solved.twin) {
      const twin = solved.twin.samples;
      n = Math.min(n, twin.t.length);
      columns.push(
        { name: 'twinAngle', at: (i) => twin.angle[i]! },
        { name: 'twinVelocity', at: (i) => twin.velocity[i]! },
        { name: 'residual', at: (i) => twin.angle[i]! - angle[i]! },
      );
    }
  } else if (solved.twin) {
    const twin = solved.twin.samples;
    n = Math.min(n, twin.t.length);
    columns.push({ name: 'angle', at: (i) => twin.angle[i]! }, { name: 'velocity', at: (i) => twin.velocity[i]! });
  }
  return { ok: true, value: format === 'csv' ? csvChunks(n, columns) : jsonChunks(solved, n, dt, columns) };
}

function* csvChunks(n: number, columns: Column[]): Generator<string> {
  yield `${columns.map((c) => c.name).join(',')}\n`;
  for (let start = 0; start < n; start += ROWS_PER_CHUNK) {
    const end = Math.min(n, start + ROWS_PER_CHUNK);
    const lines: string[] = [];
    for (let i = start; i < end; i++) lines.push(columns.map((c) => num(c.at(i))).join(','));
    yield `${lines.join('\n')}\n`;
  }
}

function* jsonChunks(solved: SolvedScenario, n: number, dt: number, columns: Column[]): Generator<string> {
  const cf = solved.closedForm;
  const head = {
    ...(cf ? { ...closedFormReport(cf), terms: cf.terms, velocityTerms: cf.velocityTerms, latex: cf.latex } : {}),
    method: solved.method,
    dt,
    ...(solved.twin ? { twinStop: solved.twin.stop } : {}),
  };
  yield `${JSON.stringify(head).slice(0, -1)}`;
  for (const column of columns) {
    yield `,${JSON.stringify(column.name)}:[`;
    yield* numberList(n, column.at);
    yield ']';
  }
  yield '}\n';
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
