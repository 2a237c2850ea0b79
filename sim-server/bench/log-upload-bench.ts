import { execFile } from 'node:child_process';
import { createWriteStream, mkdtempSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import type { BenchResult } from './bench-result';

/** File sizes measured, MB (10⁶ bytes). */
export const LOG_BENCH_SIZES_MB = [10, 25, 50] as const;

/** A 1 kHz log of time, angle (deg), velocity and torque with noise-like digits, ~50 bytes a row, until it reaches `bytes`. */
function writeLog(file: string, bytes: number): Promise<number> {
  return new Promise((resolve, reject) => {
    const out = createWriteStream(file);
    out.on('error', reject);
    out.write('time [s],angle [deg],velocity [deg/s],torque [Nm]\n');
    let written = 0;
    let i = 0;
    const more = () => {
      while (written < bytes) {
        const t = i * 0.001;
        const line = `${t.toFixed(3)},${(30 * Math.sin(2 * t)).toFixed(6)},${(60 * Math.cos(2 * t)).toFixed(6)},${(0.8 * Math.sin(7 * t + 1)).toFixed(6)}\n`;
        written += line.length;
        i++;
        if (!out.write(line)) return void out.once('drain', more);
      }
      out.end(() => resolve(i));
    };
    more();
  });
}

interface Measured {
  status: number;
  ms: number;
  peakBefore: number;
  peakAfter: number;
  samples: number;
  signals: number;
}

function measure(file: string): Promise<Measured> {
  return new Promise((resolve, reject) => {
    execFile(process.execPath, ['--import', 'tsx', fileURLToPath(new URL('./log-upload-process.ts', import.meta.url)), file], { env: process.env, maxBuffer: 1 << 20 }, (err, stdout) => {
      if (err) return reject(err);
      const line = stdout.trim().split('\n').pop() ?? '';
      resolve(JSON.parse(line) as Measured);
    });
  });
}

const MB = 1e6;

/**
 * Parsing and storing a generated CSV log through the upload route, 10, 25 and 50 MB, each in a
 * fresh process: time from the first byte sent to the stored answer, and how far the process's
 * peak RSS rose during the upload. The text is never held; what grows with the file is the
 * samples kept (8 bytes a value, the stored form) and their copy on the way to PostgreSQL.
 */
export async function benchLogUpload(): Promise<BenchResult[]> {
  const folder = mkdtempSync(path.join(tmpdir(), 'kinetwin-log-bench-'));
  const results: BenchResult[] = [];
  try {
    for (const size of LOG_BENCH_SIZES_MB) {
      const file = path.join(folder, `log-${size}mb.csv`);
      const rows = await writeLog(file, size * MB);
      const bytes = statSync(file).size;
      const m = await measure(file);
      rmSync(file, { force: true });
      const label = `${(bytes / MB).toFixed(0)} MB CSV, ${rows} rows × 4 signals (answered ${m.status})`;
      results.push(
        { name: `${label}: upload, parse and store`, median: m.ms / 1000, unit: 's', runs: 1 },
        { name: `${label}: peak RSS rise`, median: (m.peakAfter - m.peakBefore) / MB, unit: 'MB', runs: 1, goal: 'flat as the file grows' },
        { name: `${label}: peak RSS`, median: m.peakAfter / MB, unit: 'MB', runs: 1 },
        { name: `${label}: samples kept (8 B a value)`, median: (m.samples * m.signals * 8) / MB, unit: 'MB', runs: 1 },
      );
    }
  } finally {
    rmSync(folder, { recursive: true, force: true });
  }
  return results;
}
