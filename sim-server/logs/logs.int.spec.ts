import { createWriteStream, mkdtempSync, readdirSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { eq } from 'drizzle-orm';
import { jointLogSignals, jointLogs } from '../../drizzle/schema';
import { createTestTeam, demoScenarioDocument, readJson, startTestServer, type TestMember, type TestServer } from '../testing/test-server';
import { postFileStreamed } from '../testing/streamed-upload';
import { snapshotTables } from '../testing/table-snapshot';
import { loadJointLogTable, saveFitReport } from './joint-log-store';

/**
 * State that changes without any upload (sessions touched by each request), and the sample
 * columns, left out of the digest only because hashing megabytes of bytea as text is slow: a
 * stored log still shows as a row.
 */
const UNRELATED = { tables: ['session', 'sign_in_limits'], columns: { joint_log_signals: ['samples'] } };

const MESSY = '\uFEFFZeit [ms] ; Winkel (deg);Moment [Nm];Bemerkung\r\n0;0,0;0,50;start\r\n1;1,5;0,25;\r\n2;3,0;0,00;\r\n3;4,5;-0,25;end\r\n';

function form(content: string | Blob, fields: Record<string, string> = {}, fileName = 'trace.csv'): FormData {
  const f = new FormData();
  for (const [k, v] of Object.entries(fields)) f.set(k, v);
  f.set('file', typeof content === 'string' ? new Blob([content]) : content, fileName);
  return f;
}

describe('logged joint traces: upload, preview, store, list, download, delete', () => {
  let t: TestServer;
  let uploads: string;
  let engineer: TestMember;
  let lead: TestMember;
  let viewer: TestMember;
  let outsider: TestMember;
  let scenarioId: number;

  beforeAll(async () => {
    uploads = mkdtempSync(path.join(tmpdir(), 'kinetwin-log-uploads-test-'));
    t = await startTestServer({ KINETWIN_LOG_UPLOAD_DIR: uploads, KINETWIN_LOG_UPLOAD_MAX_MB: '64' });
    const [team, other] = await Promise.all([createTestTeam(t, 'Log lab'), createTestTeam(t, 'Other log lab')]);
    ({ engineer, lead, viewer } = team.members);
    outsider = other.members.admin;
    const created = await engineer.api.post('/api/scenarios', { scenario: { ...demoScenarioDocument(), name: 'Logged axis' } });
    scenarioId = (await readJson(created)).id;
  });
  afterAll(async () => {
    await t.close();
    rmSync(uploads, { recursive: true, force: true });
  });

  const logs = () => `/api/scenarios/${scenarioId}/logs`;
  const leftInUploads = () => readdirSync(uploads);

  it('previews a messy log (BOM, CRLF, semicolons, decimal commas, degrees, ms) without saving anything', async () => {
    const before = await snapshotTables(t.database.pool, UNRELATED);
    const res = await engineer.api.post(`${logs()}/preview`, form(MESSY));
    expect(res.status).toBe(200);
    const body = await readJson(res);
    expect(body.ok).toBe(true);
    expect(body.detected.header).toEqual(['Zeit [ms]', 'Winkel (deg)', 'Moment [Nm]', 'Bemerkung']);
    expect(body.detected.firstRows[1]).toEqual(['0', '0,0', '0,50', 'start']);
    expect(body.report.columns.map((c: { signal: string; unit: string }) => `${c.signal}:${c.unit}`)).toEqual(['time:ms', 'angle:deg', 'torque:N·m']);
    expect(body.report.file).toMatchObject({ separator: ';', lineEnding: 'crlf' });
    expect(body.report.bomRemoved).toBe(true);
    expect(body.series.time).toEqual([0, 0.001, 0.002, 0.003]);
    expect(body.series.values.angle[1]).toBeCloseTo((1.5 * Math.PI) / 180, 15);
    expect(await snapshotTables(t.database.pool, UNRELATED)).toEqual(before);
    expect(leftInUploads()).toEqual([]);
  });

  it('previews a refused log as a value naming the row and column, with what was found', async () => {
    const res = await engineer.api.post(`${logs()}/preview`, form('time;angle\n0;1\n1;zwei\n'));
    expect(res.status).toBe(200);
    const body = await readJson(res);
    expect(body).toMatchObject({ ok: false, error: { row: 3, column: 'column 2 ("angle")' }, message: 'row 3, column 2 ("angle"): "zwei" is not a number' });
    expect(body.detected.firstRows).toEqual([['time', 'angle'], ['0', '1'], ['1', 'zwei']]);
    expect(leftInUploads()).toEqual([]);
  });

  it('saves with the confirmed mapping, lists it for the team and downloads it as CSV in SI', async () => {
    const options = JSON.stringify({ columns: { time: 0, angle: 'Winkel (deg)', torque: 2 }, units: { time: 'ms', angle: 'deg' } });
    const res = await engineer.api.post(logs(), form(MESSY, { name: 'Bench run 1', options }));
    expect(res.status).toBe(201);
    const saved = await readJson(res);
    expect(saved).toMatchObject({ name: 'Bench run 1', fileName: 'trace.csv', sampleCount: 4, signals: ['angle', 'torque'], canDelete: true, hasFit: false, start: 0, end: 0.003 });
    expect(leftInUploads()).toEqual([]);

    // Stored compactly: one bytea of 8 bytes a sample per signal.
    const rows = await t.database.db.select({ signal: jointLogSignals.signal, samples: jointLogSignals.samples }).from(jointLogSignals).where(eq(jointLogSignals.logId, saved.id));
    expect(rows.map((r) => [r.signal, r.samples.length]).sort()).toEqual([
      ['angle', 32],
      ['time', 32],
      ['torque', 32],
    ]);
    const table = await loadJointLogTable(t.appDatabase.db, await teamIdOf(saved.id), saved.id);
    expect(Array.from(table!.torque!)).toEqual([0.5, 0.25, 0, -0.25]);

    const list = await readJson(await lead.api.get(logs()));
    expect(list.items.map((i: { name: string; canDelete: boolean }) => [i.name, i.canDelete])).toEqual([['Bench run 1', false]]);

    const csv = await viewer.api.get(`${logs()}/${saved.id}/csv`);
    expect(csv.status).toBe(200);
    expect(csv.headers.get('content-type')).toMatch(/^text\/csv/);
    expect(csv.headers.get('content-disposition')).toContain('Bench-run-1.csv');
    const lines = (await csv.text()).trim().split('\n');
    expect(lines[0]).toBe('time [s],angle [rad],torque [N·m]');
    const expected = [
      [0, 0, 0.5],
      [0.001, (1.5 * Math.PI) / 180, 0.25],
      [0.002, (3 * Math.PI) / 180, 0],
      [0.003, (4.5 * Math.PI) / 180, -0.25],
    ];
    const values = lines.slice(1).map((l) => l.split(',').map(Number));
    expect(values.length).toBe(expected.length);
    values.forEach((row, i) => row.forEach((v, j) => expect(v).toBeCloseTo(expected[i]![j]!, 15)));

    const one = await readJson(await viewer.api.get(`${logs()}/${saved.id}`));
    expect(one).toMatchObject({ id: saved.id, readOptions: { columns: { time: 0, angle: 'Winkel (deg)', torque: 2 } }, fitReport: null });
  });

  async function teamIdOf(logId: number): Promise<number> {
    const [row] = await t.database.db.select({ teamId: jointLogs.teamId }).from(jointLogs).where(eq(jointLogs.id, logId));
    return row!.teamId;
  }

  it('refuses a bad row on save naming row and column, saving nothing and leaving no temporary file', async () => {
    const before = await snapshotTables(t.database.pool, UNRELATED);
    const res = await engineer.api.post(logs(), form('time,angle\r\n0,0\r\n0.001,\r\n'));
    expect(res.status).toBe(400);
    const body = await readJson(res);
    expect(body.error).toMatchObject({ code: 'log_refused', fields: [{ field: 'file', message: expect.stringContaining('row 3, column 2 ("angle"): the cell is empty') }] });
    expect(body.error.message).toContain('nothing was saved');
    expect(await snapshotTables(t.database.pool, UNRELATED)).toEqual(before);
    expect(leftInUploads()).toEqual([]);
  });

  it('refuses bad fields, a missing file and a second file, naming the field', async () => {
    const before = await snapshotTables(t.database.pool, UNRELATED);
    const cases: [FormData | object, number, string][] = [
      [form(MESSY, { options: '{not json' }), 400, 'options'],
      [form(MESSY, { options: JSON.stringify({ columns: { temperature: 1 } }) }), 400, 'options.columns'],
      [form(MESSY, { options: JSON.stringify({ units: { angle: 'grad' } }) }), 400, 'options.units.angle'],
      [form(MESSY, { name: ' ' }), 400, 'name'],
      [form(MESSY, { name: 'bad\u0000name' }), 400, 'name'],
      [form(MESSY, { colour: 'red' }), 400, ''],
      [{ file: 'time,angle\n0,1\n' }, 400, 'file'],
    ];
    const twoFiles = form(MESSY);
    twoFiles.append('file', new Blob([MESSY]), 'second.csv');
    cases.push([twoFiles, 400, 'file']);
    const wrongField = new FormData();
    wrongField.set('upload', new Blob([MESSY]), 'x.csv');
    cases.push([wrongField, 400, 'upload']);
    for (const [body, status, field] of cases) {
      const res = await engineer.api.post(logs(), body);
      const answer = await readJson(res);
      expect(res.status, JSON.stringify(answer)).toBe(status);
      expect(answer.error.fields?.[0]?.field ?? '', JSON.stringify(answer)).toBe(field);
    }
    expect(await snapshotTables(t.database.pool, UNRELATED)).toEqual(before);
    expect(leftInUploads()).toEqual([]);
  });

  it('keeps logs inside the team: another team can neither list, read, download nor delete', async () => {
    const saved = await readJson(await engineer.api.post(logs(), form('time,angle\n0,0\n1,1\n', { name: 'Private run' })));
    for (const [method, url] of [
      ['GET', logs()],
      ['GET', `${logs()}/${saved.id}`],
      ['GET', `${logs()}/${saved.id}/csv`],
      ['DELETE', `${logs()}/${saved.id}`],
      ['POST', `${logs()}/preview`],
    ] as const) {
      const res = await outsider.api.request(method, url, method === 'POST' ? form(MESSY) : undefined);
      const text = await res.text();
      expect(res.status, `${method} ${url} ${text}`).toBe(404);
      expect(text).not.toContain('Private run');
    }
    // Their own scenario with our log's id finds nothing either.
    const theirs = await readJson(await outsider.api.post('/api/scenarios', { scenario: { ...demoScenarioDocument(), name: 'Their axis' } }));
    expect((await outsider.api.get(`/api/scenarios/${theirs.id}/logs/${saved.id}/csv`)).status).toBe(404);
    expect((await outsider.api.delete(`/api/scenarios/${theirs.id}/logs/${saved.id}`)).status).toBe(404);
    // A teammate who does not own it may read it but not delete it; the owner may.
    expect((await lead.api.get(`${logs()}/${saved.id}/csv`)).status).toBe(200);
    const byLead = await lead.api.delete(`${logs()}/${saved.id}`);
    expect(byLead.status).toBe(403);
    expect((await readJson(byLead)).error.code).toBe('not_owner');
    expect((await engineer.api.delete(`${logs()}/${saved.id}`)).status).toBe(204);
    expect((await engineer.api.get(`${logs()}/${saved.id}`)).status).toBe(404);
    // Its samples went with it.
    expect(await t.database.db.select({ signal: jointLogSignals.signal }).from(jointLogSignals).where(eq(jointLogSignals.logId, saved.id))).toEqual([]);
  });

  it('stores a fit report on a log of the team only', async () => {
    const saved = await readJson(await engineer.api.post(logs(), form('time,angle\n0,0\n1,1\n', { name: 'Fit target' })));
    const teamId = await teamIdOf(saved.id);
    expect(await saveFitReport(t.appDatabase.db, teamId + 1_000_000, saved.id, { rms: 1 })).toBe(false);
    expect(await saveFitReport(t.appDatabase.db, teamId, saved.id, { rms: 0.01 })).toBe(true);
    expect(await readJson(await engineer.api.get(`${logs()}/${saved.id}`))).toMatchObject({ hasFit: true, fitReport: { rms: 0.01 } });
  });

  it('refuses uploads to an archived scenario before receiving the file', async () => {
    const created = await readJson(await engineer.api.post('/api/scenarios', { scenario: { ...demoScenarioDocument(), name: 'Archived axis' } }));
    expect((await engineer.api.post(`/api/scenarios/${created.id}/archive`)).status).toBe(200);
    const res = await engineer.api.post(`/api/scenarios/${created.id}/logs`, form(MESSY));
    expect(res.status).toBe(409);
    expect((await readJson(res)).error.message).toContain('attaching a log to it');
    expect(leftInUploads()).toEqual([]);
  });

  it('streams ~10 and ~50 MB logs from upload to storage with memory that does not follow the file size', async () => {
    const small = path.join(uploads, '..', `kinetwin-log-10mb-${process.pid}.csv`);
    const large = path.join(uploads, '..', `kinetwin-log-50mb-${process.pid}.csv`);
    try {
      // Rows carry an unmapped note, so the text (~200 bytes a row) far outweighs the samples kept (16 bytes a row).
      await writeGeneratedLog(small, 50_000);
      await writeGeneratedLog(large, 250_000);
      const sizes = [statSync(small).size, statSync(large).size];
      expect(sizes[1]).toBeGreaterThan(45 * 1024 * 1024);
      const peaks: number[] = [];
      for (const [file, rows] of [
        [small, 50_000],
        [large, 250_000],
      ] as const) {
        const res = await postFileStreamed(`${t.baseUrl}${logs()}`, engineer.session, file, { name: `Long run ${rows}` });
        expect(res.status, res.text.slice(0, 300)).toBe(201);
        const body = JSON.parse(res.text) as { id: number; sampleCount: number };
        expect(body.sampleCount).toBe(rows);
        peaks.push(process.resourceUsage().maxRSS * 1024);
        expect(leftInUploads()).toEqual([]);
        const table = await loadJointLogTable(t.appDatabase.db, await teamIdOf(body.id), body.id);
        expect(table!.time.length).toBe(rows);
        expect(table!.angle![rows - 1]).toBeCloseTo(Math.sin((rows - 1) * 0.001), 14);
      }
      // The process's peak memory after the small log, then after the large one. Holding the text
      // would add at least the 40 MB more the large file has (twice that as a JS string); what is
      // held grows with the samples only: 16 bytes a row (3.2 MB more), their steps while timing
      // is checked, and their copy on the way to PostgreSQL.
      expect(peaks[1]! - peaks[0]!).toBeLessThan((sizes[1]! - sizes[0]!) / 2);
    } finally {
      rmSync(small, { force: true });
      rmSync(large, { force: true });
    }
  });
});

/** A log of `rows` rows at 1 kHz with an unmapped note column, written to disk a row at a time. */
function writeGeneratedLog(file: string, rows: number): Promise<void> {
  return new Promise<void>((resolve, reject) => {
    const out = createWriteStream(file);
    out.on('error', reject);
    out.write('time,angle,note\n');
    let i = 0;
    const more = () => {
      while (i < rows) {
        const line = `${(i * 0.001).toFixed(3)},${Math.sin(i * 0.001).toFixed(15)},free text the reader never keeps: ${'x'.repeat(140)}\n`;
        i++;
        if (!out.write(line)) return void out.once('drain', more);
      }
      out.end(resolve);
    };
    more();
  });
}

describe('logged joint traces: the upload limit', () => {
  let t: TestServer;
  let uploads: string;

  beforeAll(async () => {
    uploads = mkdtempSync(path.join(tmpdir(), 'kinetwin-log-limit-test-'));
    t = await startTestServer({ KINETWIN_LOG_UPLOAD_DIR: uploads, KINETWIN_LOG_UPLOAD_MAX_MB: '1' });
  });
  afterAll(async () => {
    await t.close();
    rmSync(uploads, { recursive: true, force: true });
  });

  it('refuses a file over KINETWIN_LOG_UPLOAD_MAX_MB with 413, saving nothing and leaving no temporary file', async () => {
    const { members } = await createTestTeam(t, 'Limit lab');
    const created = await readJson(await members.engineer.api.post('/api/scenarios', { scenario: demoScenarioDocument() }));
    const before = await snapshotTables(t.database.pool, UNRELATED);
    const big = `time,angle\n${'0.001,0.5\n'.repeat(150_000)}`;
    const res = await members.engineer.api.post(`/api/scenarios/${created.id}/logs`, form(big));
    expect(res.status).toBe(413);
    expect((await readJson(res)).error.message).toContain('KINETWIN_LOG_UPLOAD_MAX_MB');
    expect(await snapshotTables(t.database.pool, UNRELATED)).toEqual(before);
    expect(readdirSync(uploads)).toEqual([]);
  });
});
