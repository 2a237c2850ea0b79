import { mkdirSync } from 'node:fs';
import { unlink } from 'node:fs/promises';
import type { Request, RequestHandler } from 'express';
import multer from 'multer';
import { LOG_FILE_FIELD, MAX_LOG_OPTIONS_LENGTH } from '../../shared/protocol/log-api';
import { AppError } from '../http/app-error';

/**
 * Log uploads: multer writes the one file part to a temporary file (never to memory, so a 50 MB
 * log costs no heap), within the configured size limit; the route reads it from there and the
 * file is removed when the request ends, whatever the outcome.
 */

/** Paths (as the route table records them) whose POST takes a multipart log upload. */
export const LOG_UPLOAD_PATHS = ['/api/scenarios/:id/logs/preview', '/api/scenarios/:id/logs'] as const;

function matches(pattern: string, path: string): boolean {
  const want = pattern.split('/');
  const got = path.split('/');
  return want.length === got.length && want.every((part, i) => part.startsWith(':') || part === got[i]);
}

/** Whether a request is a log upload, so the JSON-only guard lets its multipart body through. */
export function isLogUpload(req: Request): boolean {
  const path = `${req.baseUrl}${req.path}`.replace(/\/$/, '');
  return req.method === 'POST' && LOG_UPLOAD_PATHS.some((p) => matches(p, path));
}

export interface LogUploadSettings {
  maxBytes: number;
  dir: string;
}

function mib(bytes: number): string {
  return `${Number((bytes / (1024 * 1024)).toFixed(2))} MiB`;
}

/** multer's and busboy's refusals as AppErrors: 413 for size, 400 for a malformed form, 503 when the disk fails. */
function uploadError(err: unknown, maxBytes: number): AppError {
  if (err instanceof multer.MulterError) {
    switch (err.code) {
      case 'LIMIT_FILE_SIZE':
        return new AppError(413, 'too_large', `The log is larger than the upload limit of ${mib(maxBytes)} (KINETWIN_LOG_UPLOAD_MAX_MB); nothing was saved.`, [{ field: LOG_FILE_FIELD, message: `larger than ${mib(maxBytes)}` }]);
      case 'LIMIT_UNEXPECTED_FILE':
      case 'LIMIT_FILE_COUNT':
        return AppError.badRequest(`An upload carries one file, in the field "${LOG_FILE_FIELD}"; nothing was saved.`, [{ field: err.field ?? LOG_FILE_FIELD, message: `only one file, named "${LOG_FILE_FIELD}", is taken` }]);
      case 'LIMIT_FIELD_VALUE':
        return new AppError(413, 'too_large', `The form field "${err.field ?? ''}" is too long; nothing was saved.`, [{ field: err.field ?? '', message: 'too long' }]);
      default:
        return AppError.badRequest(`The upload form was refused (${err.message}); nothing was saved.`, [{ field: err.field ?? '', message: err.message }]);
    }
  }
  const code = (err as { code?: unknown }).code;
  if (typeof code === 'string' && /^E[A-Z]+$/.test(code)) return new AppError(503, 'upload_storage', 'The server could not store the upload for reading; try again later. Nothing was saved.');
  return AppError.badRequest(`The upload is not a well-formed multipart/form-data body (${String((err as { message?: unknown }).message ?? err).slice(0, 120)}); nothing was saved.`);
}

/** Removes an uploaded file; one already gone is fine. */
export async function removeUpload(path: string): Promise<void> {
  await unlink(path).catch((err: { code?: string }) => {
    if (err.code !== 'ENOENT') throw err;
  });
}

/**
 * Receives the log file into `dir`. A request that is not multipart passes with no file (the
 * route answers for it). The file is removed when the response is done or the client goes away.
 */
export function receiveLogUpload(settings: LogUploadSettings): RequestHandler {
  mkdirSync(settings.dir, { recursive: true });
  const upload = multer({
    dest: settings.dir,
    limits: { fileSize: settings.maxBytes, files: 1, fields: 4, parts: 6, fieldNameSize: 100, fieldSize: MAX_LOG_OPTIONS_LENGTH * 4, headerPairs: 40 },
  }).single(LOG_FILE_FIELD);
  return (req, res, next) => {
    upload(req, res, (err?: unknown) => {
      const file = req.file;
      if (file) res.on('close', () => void removeUpload(file.path).catch(() => undefined));
      if (err) {
        const refused = uploadError(err, settings.maxBytes);
        if (!file) return next(refused);
        return void removeUpload(file.path)
          .catch(() => undefined)
          .then(() => next(refused));
      }
      next();
    });
  };
}
