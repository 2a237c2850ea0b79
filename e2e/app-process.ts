import { spawn, type ChildProcess } from 'node:child_process';
import { fileURLToPath } from 'node:url';

const root = fileURLToPath(new URL('..', import.meta.url));

/** The real server as its own process, on a free port, against DATABASE_URL. */
export interface AppProcess {
  baseUrl: string;
  stop(): Promise<void>;
}

export function startAppProcess(env: Record<string, string> = {}): Promise<AppProcess> {
  return new Promise((resolve, reject) => {
    const child: ChildProcess = spawn(process.execPath, ['--import', 'tsx', 'sim-server/main.ts'], {
      cwd: root,
      env: { ...process.env, PORT: '0', LOG_LEVEL: 'warn', KINETWIN_MODE: 'demo', ...env },
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let output = '';
    const timer = setTimeout(() => {
      child.kill('SIGKILL');
      reject(new Error(`the server did not come up within 30 s:\n${output}`));
    }, 30_000);
    const onData = (chunk: Buffer) => {
      output += chunk.toString();
      const match = /is up: (http:\/\/\S+?)\/?\s/.exec(output);
      if (match) {
        clearTimeout(timer);
        resolve({
          baseUrl: match[1]!,
          stop: () =>
            new Promise<void>((done) => {
              if (child.exitCode !== null) return done();
              child.once('exit', () => done());
              child.kill('SIGTERM');
            }),
        });
      }
    };
    child.stdout!.on('data', onData);
    child.stderr!.on('data', (chunk: Buffer) => (output += chunk.toString()));
    child.once('exit', (code) => {
      clearTimeout(timer);
      reject(new Error(`the server exited with code ${code} before it was up:\n${output}`));
    });
  });
}
