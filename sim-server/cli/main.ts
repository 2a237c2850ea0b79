import { readFile } from 'node:fs/promises';
import { runCli } from './run-cli';

// The kinetwin command's process edge: real files and streams in, an exit code out.

// A reader that stops early (`| head`) closes the pipe: that ends the output, it is not a failure.
process.stdout.on('error', (err: NodeJS.ErrnoException) => {
  if (err.code === 'EPIPE') process.exit(0);
  throw err;
});
const exitCode = await runCli(process.argv.slice(2), {
  readText: (path) => readFile(path, 'utf8'),
  writeOut: (chunk) =>
    new Promise<void>((resolve, reject) => {
      process.stdout.write(chunk, (err) => (err ? reject(err) : resolve()));
    }),
  writeErr: (text) => {
    process.stderr.write(text);
  },
});
process.exitCode = exitCode;
