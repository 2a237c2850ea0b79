import { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import type { Request, RequestHandler } from 'express';
import { logCsvChunks } from '../../shared/calibration/log-csv';
import { thinnedSeries } from '../../shared/calibration/log-preview';
import { describeLogError, LOG_FILE_FIELD, LOG_PREVIEW_POINTS, MAX_LOG_NAME_LENGTH, parseLogUploadFields, type JointLogList, type LogPreview, type LogUploadFields } from '../../shared/protocol/log-api';
import { findUnsafeText } from '../../shared/validation/unsafe-text';
import { userOf } from '../auth/require-user';
import type { GuardedRouter } from '../auth/route-table';
import type { Database } from '../db/database';
import { AppError } from '../http/app-error';
import { idParam } from '../library/request-input';
import { refuseIfArchived } from '../scenarios/scenario-access';
import { requireScenario } from '../scenarios/scenario-detail';
import { deleteJointLog, insertJointLog, listJointLogs, loadJointLog, loadJointLogTable, summaryOf, type JointLogRecord } from './joint-log-store';
import { receiveLogUpload, removeUpload, type LogUploadSettings } from './log-upload';
import { readLogFile, type ReadLogFileResult } from './read-log-file';

export interface LogRouteDeps {
  db: Database;
  upload: LogUploadSettings;
}

/** Same words for a missing id and another team's or scenario's: nothing leaks. */
function logNotFound(scenarioId: number, logId: number): AppError {
  return AppError.notFound(`Scenario ${scenarioId} has no log ${logId}.`);
}

/** The scenario is checked (team, not archived) before the file is received, so a refused upload writes nothing to disk. */
function scenarioOpenForLogs(db: Database): RequestHandler {
  return async (req, _res, next) => {
    const scenario = await requireScenario(db, userOf(req), idParam(req, 'id', 'scenario id'));
    refuseIfArchived(scenario, 'attachLog');
    next();
  };
}

/** The uploaded file and its fields, checked; every refusal is a 400 naming the field. */
function uploadOf(req: Request): { path: string; fileName: string; fields: LogUploadFields } {
  const file = req.file;
  if (!file) throw AppError.badRequest(`Send the log as multipart/form-data with its file in the field "${LOG_FILE_FIELD}"; nothing was saved.`, [{ field: LOG_FILE_FIELD, message: 'no file was sent' }]);
  // The guard before the routes saw no multipart body: its text fields and the file name are checked here.
  const unsafe = findUnsafeText({ ...(req.body as Record<string, unknown>), fileName: file.originalname });
  if (unsafe) throw AppError.badRequest(`The upload was refused: ${unsafe.message}; nothing was saved.`, [unsafe]);
  const fields = parseLogUploadFields(req.body);
  if (!fields.ok) throw AppError.badRequest('The upload fields are not valid; nothing was saved.', fields.errors);
  return { path: file.path, fileName: file.originalname.slice(0, 200), fields: fields.value };
}

/**
 * Runs `use` on the checked upload and removes the file before the answer goes out (success or
 * refusal), so a client that has its answer finds no temporary file left behind.
 */
async function withUpload<T>(req: Request, use: (upload: ReturnType<typeof uploadOf>) => Promise<T>): Promise<T> {
  const file = req.file;
  try {
    return await use(uploadOf(req));
  } finally {
    if (file) await removeUpload(file.path);
  }
}

/** A name for a log with none given: its file name without the extension. */
function defaultName(fileName: string): string {
  const bare = fileName.replace(/\.[A-Za-z0-9]{1,5}$/, '').trim();
  return (bare || 'log').slice(0, MAX_LOG_NAME_LENGTH);
}

function refusal(result: Extract<ReadLogFileResult, { ok: false }>): AppError {
  const line = describeLogError(result.error);
  return new AppError(400, 'log_refused', `The log was refused: ${line}; nothing was saved.`, [{ field: LOG_FILE_FIELD, message: line }]);
}

/** A file name safe in any Content-Disposition: letters, digits, dash, underscore, dot. */
function downloadName(name: string): string {
  return `${name.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 80) || 'log'}.csv`;
}

async function requireLog(db: Database, req: Request): Promise<JointLogRecord> {
  const user = userOf(req);
  const id = idParam(req, 'id', 'scenario id');
  const logId = idParam(req, 'logId', 'log id');
  await requireScenario(db, user, id);
  const record = await loadJointLog(db, user.teamId, logId);
  if (!record || record.scenarioId !== id) throw logNotFound(id, logId);
  return record;
}

/** Logged joint traces on a scenario: preview and save an upload, list, download as CSV, delete. */
export function logRoutes({ route }: GuardedRouter, { db, upload }: LogRouteDeps): void {
  const receive = receiveLogUpload(upload);

  route('post', '/:id/logs/preview', 'log.upload', scenarioOpenForLogs(db), receive, async (req, res) => {
    const result = await withUpload(req, ({ path, fields }) => readLogFile(path, fields.options));
    const body: LogPreview = result.ok
      ? { ok: true, detected: result.detected, report: result.report, series: thinnedSeries(result.table, LOG_PREVIEW_POINTS) }
      : { ok: false, detected: result.detected, error: result.error, message: describeLogError(result.error) };
    res.json(body);
  });

  route('post', '/:id/logs', 'log.upload', scenarioOpenForLogs(db), receive, async (req, res) => {
    const user = userOf(req);
    const scenarioId = idParam(req, 'id', 'scenario id');
    const { result, fileName, fields } = await withUpload(req, async ({ path, fileName, fields }) => ({ result: await readLogFile(path, fields.options), fileName, fields }));
    if (!result.ok) throw refusal(result);
    const record = await insertJointLog(db, {
      teamId: user.teamId,
      scenarioId,
      ownerId: user.id,
      name: fields.name ?? defaultName(fileName),
      fileName,
      readOptions: fields.options,
      table: result.table,
      report: result.report,
    });
    res.status(201).json({ ...summaryOf(record, user.id), report: record.report });
  });

  route('get', '/:id/logs', 'log.read', async (req, res) => {
    const user = userOf(req);
    const id = idParam(req, 'id', 'scenario id');
    await requireScenario(db, user, id);
    const body: JointLogList = { items: (await listJointLogs(db, user.teamId, id)).map((r) => summaryOf(r, user.id)) };
    res.json(body);
  });

  route('get', '/:id/logs/:logId', 'log.read', async (req, res) => {
    const record = await requireLog(db, req);
    res.json({ ...summaryOf(record, userOf(req).id), report: record.report, readOptions: record.readOptions, fitReport: record.fitReport });
  });

  route('get', '/:id/logs/:logId/csv', 'log.read', async (req, res) => {
    const record = await requireLog(db, req);
    const table = await loadJointLogTable(db, record.teamId, record.id);
    if (!table) throw logNotFound(record.scenarioId, record.id);
    res.type('text/csv; charset=utf-8');
    res.attachment(downloadName(record.name));
    try {
      // Written a block of rows at a time, each after the client took the last (backpressure).
      await pipeline(Readable.from(logCsvChunks(table)), res);
    } catch (err) {
      // A client that goes away mid-download is not a server fault.
      if ((err as { code?: unknown }).code !== 'ERR_STREAM_PREMATURE_CLOSE') throw err;
    }
  });

  route('delete', '/:id/logs/:logId', 'log.delete', async (req, res) => {
    const user = userOf(req);
    const record = await requireLog(db, req);
    if (record.ownerId !== user.id) throw new AppError(403, 'not_owner', `Only the log's owner, ${record.ownerName}, may delete it.`);
    if (!(await deleteJointLog(db, user.teamId, record.id))) throw logNotFound(record.scenarioId, record.id);
    res.status(204).end();
  });
}
