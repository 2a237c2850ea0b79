import { randomBytes } from 'node:crypto';
import { createReadStream, statSync } from 'node:fs';
import { request } from 'node:http';
import type { TestSession } from './test-server';

/**
 * POSTs a file from disk as multipart/form-data, streamed with backpressure. fetch with a
 * FormData body (even a file-backed Blob) gathers the whole body in memory first, which would
 * hide whether the server streams: a test of memory needs a client that does not.
 */
export function postFileStreamed(url: string, session: TestSession, filePath: string, fields: Record<string, string> = {}, fileField = 'file'): Promise<{ status: number; text: string }> {
  const boundary = `----kinetwin${randomBytes(12).toString('hex')}`;
  const head =
    Object.entries(fields)
      .map(([name, value]) => `--${boundary}\r\nContent-Disposition: form-data; name="${name}"\r\n\r\n${value}\r\n`)
      .join('') + `--${boundary}\r\nContent-Disposition: form-data; name="${fileField}"; filename="upload.csv"\r\nContent-Type: text/csv\r\n\r\n`;
  const tail = `\r\n--${boundary}--\r\n`;
  const length = Buffer.byteLength(head) + statSync(filePath).size + Buffer.byteLength(tail);
  return new Promise((resolve, reject) => {
    const req = request(url, {
      method: 'POST',
      headers: { 'content-type': `multipart/form-data; boundary=${boundary}`, 'content-length': String(length), cookie: session.cookie, 'x-csrf-token': session.csrfToken },
    });
    req.on('error', reject);
    req.on('response', (res) => {
      const parts: Buffer[] = [];
      res.on('data', (chunk: Buffer) => parts.push(chunk));
      res.on('end', () => resolve({ status: res.statusCode ?? 0, text: Buffer.concat(parts).toString('utf8') }));
      res.on('error', reject);
    });
    req.write(head);
    const file = createReadStream(filePath);
    file.on('error', reject);
    file.pipe(req, { end: false });
    file.on('end', () => req.end(tail));
  });
}
