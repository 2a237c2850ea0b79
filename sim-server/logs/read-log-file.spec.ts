import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { Readable } from 'node:stream';
import { afterAll, describe, expect, it } from 'vitest';
import { LOG_HEAD_BYTES, readLogFile } from './read-log-file';

const folder = mkdtempSync(path.join(tmpdir(), 'kinetwin-read-log-'));
afterAll(() => rmSync(folder, { recursive: true, force: true }));

function file(name: string, content: string | Buffer): string {
  const where = path.join(folder, name);
  writeFileSync(where, content);
  return where;
}

/** A log generated row by row, counting the bytes handed out, so a test can see how far the reader pulled. */
function generated(rows: number, row: (i: number) => string, header = 'time,angle\n'): { stream: Readable; produced: () => number } {
  let produced = 0;
  function* lines() {
    let chunk = header;
    for (let i = 0; i < rows; i++) {
      chunk += row(i);
      if (chunk.length >= 16 * 1024) {
        produced += chunk.length;
        yield chunk;
        chunk = '';
      }
    }
    produced += chunk.length;
    yield chunk;
  }
  return { stream: Readable.from(lines(), { objectMode: false }), produced: () => produced };
}

describe('readLogFile', () => {
  it('reads a semicolon log with decimal commas, degrees, a BOM and CRLF into SI', async () => {
    const where = file('messy.csv', '\uFEFFZeit [ms];Winkel [deg];Moment [Nm]\r\n0;90,0;0,5\r\n1;180,0;0,25\r\n2;270,0;0\r\n');
    const r = await readLogFile(where);
    if (!r.ok) throw new Error(JSON.stringify(r.error));
    expect(Array.from(r.table.time)).toEqual([0, 0.001, 0.002]);
    expect(r.table.angle![1]).toBeCloseTo(Math.PI, 15);
    expect(Array.from(r.table.torque!)).toEqual([0.5, 0.25, 0]);
    expect(r.report.file).toMatchObject({ separator: ';', lineEnding: 'crlf' });
    expect(r.report.bomRemoved).toBe(true);
    expect(r.report.decimalMark).toBe(',');
    expect(r.report.header).toEqual(['Zeit [ms]', 'Winkel [deg]', 'Moment [Nm]']);
  });

  it('reads tab-separated logs, quoted cells and a stream as well as a path', async () => {
    const r = await readLogFile(Readable.from(['"time"\t"angle"\n0\t"1.5"\n', '1\t2\n']));
    if (!r.ok) throw new Error(JSON.stringify(r.error));
    expect(r.report.file.separator).toBe('\t');
    expect(Array.from(r.table.angle!)).toEqual([1.5, 2]);
  });

  it('takes the mapping and units the user confirmed', async () => {
    const where = file('plain.csv', 'a,b,c\n0,1,2\n1,3,4\n');
    const r = await readLogFile(where, { columns: { time: 'a', velocity: 'c' }, units: { velocity: 'deg/s' } });
    if (!r.ok) throw new Error(JSON.stringify(r.error));
    expect(r.table.velocity![1]).toBeCloseTo((4 * Math.PI) / 180, 15);
  });

  it('names the row and column of a bad cell as an editor counts lines', async () => {
    const where = file('bad.csv', 'time;angle\r\n0;1\r\n\r\n1;x\r\n');
    expect(await readLogFile(where)).toMatchObject({ ok: false, error: { row: 4, column: 'column 2 ("angle")', reason: '"x" is not a number' } });
  });

  it('refuses UTF-16, a file without separators, and an unclosed quote, naming the row', async () => {
    const utf16 = file('utf16.csv', Buffer.concat([Buffer.from([0xff, 0xfe]), Buffer.from('time,angle\n0,1\n', 'utf16le')]));
    expect(await readLogFile(utf16)).toMatchObject({ ok: false, error: { row: 1, reason: expect.stringContaining('UTF-16') } });
    expect(await readLogFile(file('one.csv', 'time\n0\n1\n'))).toMatchObject({ ok: false, error: { reason: expect.stringContaining('no separator found') } });
    const quote = await readLogFile(file('quote.csv', 'time,angle\n0,1\n1,"2\n2,3\n'));
    expect(quote).toMatchObject({ ok: false, error: { reason: 'a quoted cell is never closed' } });
  });

  it('refuses a missing file as a value, never rejecting', async () => {
    expect(await readLogFile(path.join(folder, 'nowhere.csv'))).toEqual({ ok: false, error: { row: null, column: null, reason: 'the log could not be read: there is no such file' }, detected: null });
    expect(await readLogFile(folder)).toMatchObject({ ok: false, error: { reason: expect.stringContaining('folder') } });
  });

  it('refuses a stream that breaks mid-way as a value', async () => {
    const broken = new Readable({
      read() {
        this.push('time,angle\n0,1\n');
        this.destroy(new Error('connection reset'));
      },
    });
    expect(await readLogFile(broken)).toMatchObject({ ok: false, error: { row: null, reason: expect.stringContaining('connection reset') } });
  });

  it('streams: a refusal early in a huge log stops reading it, so the file is never pulled whole', async () => {
    // 3 million rows (~50 MB) with a bad cell on row 1001.
    const log = generated(3_000_000, (i) => (i === 999 ? `${i * 0.001},oops\n` : `${(i * 0.001).toFixed(3)},${Math.sin(i * 0.001).toFixed(9)}\n`));
    const r = await readLogFile(log.stream);
    expect(r).toMatchObject({ ok: false, error: { row: 1001, column: 'column 2 ("angle")' } });
    expect(log.produced()).toBeLessThan(LOG_HEAD_BYTES + 256 * 1024);
    expect(log.stream.destroyed).toBe(true);
  });

  it('reads a long generated log to the end with every sample in place', async () => {
    const rows = 200_000;
    const log = generated(rows, (i) => `${(i * 0.001).toFixed(3)},${(i % 7) * 0.5}\n`);
    const r = await readLogFile(log.stream);
    if (!r.ok) throw new Error(JSON.stringify(r.error));
    expect(r.report.samples).toBe(rows);
    expect(r.table.time[rows - 1]).toBeCloseTo((rows - 1) * 0.001, 9);
    expect(r.table.angle![rows - 1]).toBe(((rows - 1) % 7) * 0.5);
    expect(r.report.timing.uniform).toBe(true);
    expect(r.report.file.bytes).toBe(log.produced());
  });
});
