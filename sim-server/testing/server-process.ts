import { spawn } from 'node:child_process';
import { fileURLToPath } from 'node:url';

const root = fileURLToPath(new URL('../..', import.meta.url));

/** The real server (`node --import tsx sim-server/main.ts`) as a process of its own, for fault tests. */
export interface ServerProcess {
  baseUrl: string;
  /** Everything it wrote to stdout and stderr so far. */
  output(): string;
  /** Resolves with the exit code (null when a signal ended it) once the process has exited. */
  exited: Promise<number | null>;
  /** Sends `signal` and waits for the process to exit; SIGKILL gives it no chance to clean up. */
  kill(signal: NodeJS.Signals): Promise<void>;
}

/** Starts the server on a free loopback port with `env` over this process's environment. */
export function startServerProcess(env: Record<string, string>): Promise<ServerProcess> {
  return new Promise((resolve, reject) => {
    // One process, not `npx tsx`, so a kill really ends the server and frees its connections.
    const child = spawn(process.execPath, ['--import', 'tsx', 'sim-server/main.ts'], {
      cwd: root,
      env: { ...process.env, PORT: '0', LOG_LEVEL: 'warn', KINETWIN_MODE: 'demo', ...env },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let output = '';
    const exited = new Promise<number | null>((done) => child.once('exit', (code) => done(code)));
    const timer = setTimeout(() => {
      child.kill('SIGKILL');
      reject(new Error(`the server did not come up within 60 s:\n${output}`));
    }, 60_000);
    child.stdout.on('data', (chunk: Buffer) => {
      output += chunk.toString();
      const match = /is up: (http:\/\/\S+?)\/?\s/.exec(output);
      if (match) {
        clearTimeout(timer);
        resolve({
          baseUrl: match[1]!,
          output: () => output,
          exited,
          kill: async (signal) => {
            if (child.exitCode === null && child.signalCode === null) child.kill(signal);
            await exited;
          },
        });
      }
    });
    child.stderr.on('data', (chunk: Buffer) => (output += chunk.toString()));
    void exited.then((code) => {
      clearTimeout(timer);
      reject(new Error(`the server exited with code ${code} before it was up:\n${output}`));
    });
  });
}
