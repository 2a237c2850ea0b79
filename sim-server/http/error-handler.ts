import type { ErrorRequestHandler, RequestHandler } from 'express';
import type { ApiErrorBody } from '../../shared/protocol/api-types';
import type { Logger } from '../logging/logger';
import { AppError } from './app-error';
import { databaseUnavailableError } from './database-unavailable';

/** The one error handler, registered last: AppErrors answer as themselves, the rest as 500. */
export function errorHandler(logger: Logger): ErrorRequestHandler {
  return (err, req, res, _next) => {
    let body: ApiErrorBody;
    let status: number;
    err = databaseUnavailableError(err) ?? err;
    if (err instanceof AppError) {
      status = err.status;
      body = { error: { code: err.code, message: err.message, ...(err.fields ? { fields: err.fields } : {}) } };
    } else if (err?.type === 'entity.parse.failed') {
      status = 400;
      body = { error: { code: 'bad_json', message: 'The request body is not valid JSON.' } };
    } else if (err?.type === 'entity.too.large') {
      status = 413;
      body = { error: { code: 'too_large', message: 'The request body is too large.' } };
    } else {
      status = 500;
      logger.error({ err, method: req.method, url: req.originalUrl }, 'unhandled error');
      body = { error: { code: 'internal', message: 'Something went wrong on the server; it has been logged.' } };
    }
    if (res.headersSent) return;
    res.status(status).json(body);
  };
}

/** 404 for any /api path no route answered. */
export const apiNotFound: RequestHandler = (req, _res, next) => {
  next(AppError.notFound(`No API route ${req.method} ${req.path}.`));
};
