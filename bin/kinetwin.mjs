#!/usr/bin/env node
// The `kinetwin` command: runs the TypeScript CLI through tsx, resolved from this package so
// `npx kinetwin` works from any directory, and exits with the CLI's own exit code.
import { spawn } from 'node:child_process';
import { createRequire } from 'node:module';
import { constants } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';

const packageRoot = join(dirname(fileURLToPath(import.meta.url)), '..');
const require = createRequire(join(packageRoot, 'package.json'));
const tsxLoader = pathToFileURL(require.resolve('tsx')).href;
const main = join(packageRoot, 'sim-server', 'cli', 'main.ts');

const child = spawn(process.execPath, ['--import', tsxLoader, main, ...process.argv.slice(2)], { stdio: 'inherit' });
for (const signal of ['SIGINT', 'SIGTERM']) {
  process.on(signal, () => child.kill(signal));
}
child.on('error', (err) => {
  process.stderr.write(`kinetwin: could not start the CLI: ${err.message}\n`);
  process.exit(2);
});
child.on('exit', (code, signal) => {
  // A child ended by a signal exits the shell way: 128 + the signal's number.
  process.exit(code ?? 128 + (constants.signals[signal] ?? 0));
});
