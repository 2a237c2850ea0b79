import { spawn } from 'node:child_process';
import { fileURLToPath } from 'node:url';

const root = fileURLToPath(new URL('../..', import.meta.url));

/** Runs the real server entry point with `env` over this process's, until it exits or is up (then SIGTERM). */
export function runMain(env: Record<string, string | undefined>): Promise<{ code: number | null; stderr: string; stdout: string }> {
  return new Promise((resolve) => {
    const child = spawn(process.execPath, ['--import', 'tsx', 'sim-server/main.ts'], {
      cwd: root,
      env: { ...process.env, LOG_LEVEL: 'silent', ...env } as NodeJS.ProcessEnv,
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (d: Buffer) => {
      stdout += d.toString();
      if (stdout.includes('is up:')) child.kill('SIGTERM');
    });
    child.stderr.on('data', (d: Buffer) => (stderr += d.toString()));
    child.on('exit', (code) => resolve({ code, stderr, stdout }));
  });
}
