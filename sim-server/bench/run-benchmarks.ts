import os from 'node:os';
import type { BenchResult } from './bench-result';
import { benchChecks } from './checks-bench';
import { benchClosedForm } from './closed-form-bench';
import { benchFit } from './fit-bench';
import { benchFrequency } from './frequency-bench';
import { benchGainMap } from './gain-map-bench';
import { benchLiveSessions } from './live-sessions-bench';
import { benchLogUpload } from './log-upload-bench';
import { benchSignIn } from './sign-in-bench';
import { benchStiffRun } from './stiff-run-bench';
import { benchTwin } from './twin-bench';

/**
 * `npm run bench`: measures and prints every figure the README records, as a markdown table.
 * Benchmarks, not tests: nothing here passes or fails.
 */
async function main() {
  const databaseUrl = process.env['DATABASE_URL'];
  if (!databaseUrl) {
    process.stderr.write('bench: DATABASE_URL is required for the live-session figure (npm run bench sets it)\n');
    process.exit(2);
  }
  const started = new Date();
  const sections: [string, () => Promise<BenchResult[]>][] = [
    ['closed form', benchClosedForm],
    ['frequency', benchFrequency],
    ['twin', benchTwin],
    ['gain map', benchGainMap],
    ['fit', benchFit],
    ['live runs', () => benchLiveSessions(databaseUrl)],
    ['stiff live run', benchStiffRun],
    ['sign-in', () => benchSignIn(databaseUrl)],
    ['checks', () => benchChecks(databaseUrl)],
    ['log upload', benchLogUpload],
  ];
  // `npm run bench -- "log upload"` measures only the sections named.
  const only = process.argv.slice(2);
  const unknown = only.filter((name) => !sections.some(([section]) => section === name));
  if (unknown.length > 0) {
    process.stderr.write(`bench: no section ${unknown.map((n) => JSON.stringify(n)).join(', ')}; the sections are ${sections.map(([s]) => s).join(', ')}\n`);
    process.exit(2);
  }
  const rows: [string, BenchResult][] = [];
  for (const [section, run] of sections) {
    if (only.length > 0 && !only.includes(section)) continue;
    process.stdout.write(`measuring: ${section} …\n`);
    for (const result of await run()) rows.push([section, result]);
  }
  const cpus = os.cpus();
  process.stdout.write(
    `\nKinetwin benchmarks, ${started.toISOString().slice(0, 10)}, Node ${process.version}, ${cpus.length} × ${cpus[0]?.model.trim() ?? 'unknown CPU'}, load average ${os.loadavg()[0]!.toFixed(1)}\n\n`,
  );
  process.stdout.write('| part | figure | median | runs | goal |\n|---|---|---|---|---|\n');
  for (const [section, r] of rows) {
    process.stdout.write(`| ${section} | ${r.name} | ${format(r.median)} ${r.unit} | ${r.runs} | ${r.goal ?? '—'} |\n`);
  }
}

function format(x: number): string {
  if (!Number.isFinite(x)) return String(x);
  const abs = Math.abs(x);
  return abs >= 100 ? x.toFixed(0) : abs >= 10 ? x.toFixed(1) : abs >= 1 ? x.toFixed(2) : x.toPrecision(3);
}

void main();
