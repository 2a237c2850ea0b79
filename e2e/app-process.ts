import { spawn, type ChildProcess } from 'node:child_process';
import { fileURLToPath } from 'node:url';

const root = fileURLToPath(new URL('..', import.meta.url));

/**
 * The real server as its own process, on a free port: it migrates and seeds as the owner
 * (DATABASE_OWNER_URL) and serves as the app role (DATABASE_URL), as npm start runs it.
 */
export interface AppProcess {
  baseUrl: string;
  stop(): Promise<void>;
}

export function startAppProcess(env: Record<string, string> = {}): Promise<AppProcess> {
  const databaseUrl = env['DATABASE_URL'] ?? process.env['DATABASE_URL'];
  const databaseOwnerUrl = env['DATABASE_OWNER_URL'] ?? process.env['DATABASE_OWNER_URL'];
  if (!databaseUrl || !databaseOwnerUrl) {
    return Promise.reject(new Error('the browser tests need DATABASE_URL and DATABASE_OWNER_URL: eval "$(scripts/local-postgres.sh env kinetwin_test)"'));
  }
  return new Promise((resolve, reject) => {
    const child: ChildProcess = spawn(process.execPath, ['--import', 'tsx', 'sim-server/main.ts'], {
      cwd: root,
      env: { ...process.env, PORT: '0', LOG_LEVEL: 'warn', KINETWIN_MODE: 'demo', ...env, DATABASE_URL: databaseUrl, DATABASE_OWNER_URL: databaseOwnerUrl },
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
