import type { CliIo } from '../run-cli';

/**
 * The command line's files and streams in memory, so a spec runs a whole command in-process:
 * `files` by path, stdout and stderr collected. `extra` adds what one command needs (a log reader).
 */
export function memoryIo(files: Record<string, string>, extra: Partial<CliIo> = {}) {
  const out: string[] = [];
  const err: string[] = [];
  const io: CliIo = {
    readText: async (path) => {
      if (!(path in files)) throw Object.assign(new Error(`ENOENT: no such file or directory, open '${path}'`), { code: 'ENOENT' });
      return files[path]!;
    },
    writeOut: async (chunk) => {
      out.push(chunk);
    },
    writeErr: (text) => {
      err.push(text);
    },
    ...extra,
  };
  return { io, out: () => out.join(''), err: () => err.join('') };
}
