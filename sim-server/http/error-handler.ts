import type { ErrorRequestHandler, RequestHandler, Response } from 'express';
import type { ApiErrorBody } from '../../shared/protocol/api-types';
import type { Logger } from '../logging/logger';
import { AppError } from './app-error';
import { databaseUnavailableError } from './database-unavailable';

interface ClientFault {
  status: number;
  code: string;
  message: string;
  /** Headers the answer should carry (e.g. which content codings would have been accepted). */
  headers?: Record<string, string>;
}

/**
 * Errors body-parser, raw-body and the router raise for a request the client got wrong, by the
 * `type` body-parser sets; they carry a 4xx status but are not AppErrors.
 */
function bodyParserFault(err: { type?: unknown; encoding?: unknown; charset?: unknown }): ClientFault | null {
  switch (err.type) {
    case 'entity.parse.failed':
      return { status: 400, code: 'bad_json', message: 'The request body is not valid JSON.' };
    case 'entity.too.large':
      return { status: 413, code: 'too_large', message: 'The request body is too large.' };
    case 'encoding.unsupported':
      // RFC 9110 §15.5.16: a 415 for a content coding ought to list the accepted ones (§12.5.3).
      return {
        status: 415,
        code: 'unsupported_encoding',
        message: `The request body's Content-Encoding ${JSON.stringify(String(err.encoding ?? '').slice(0, 40))} is not accepted; send it uncompressed.`,
        headers: { 'Accept-Encoding': 'identity' },
      };
    case 'charset.unsupported':
      // RFC 8259 §8.1: JSON exchanged between systems is UTF-8.
      return { status: 415, code: 'unsupported_charset', message: `The request body's charset ${JSON.stringify(String(err.charset ?? '').slice(0, 40))} is not accepted; send UTF-8.` };
    case 'request.aborted':
      return { status: 400, code: 'aborted', message: 'The request body ended before it was complete.' };
    case 'request.size.invalid':
      return { status: 400, code: 'bad_length', message: 'The request body does not match its Content-Length.' };
    default:
      return null;
  }
}

/** A client fault that is not an AppError: body reading, path decoding, or any exposed 4xx. */
function clientFault(err: unknown): ClientFault | null {
  if (err === null || typeof err !== 'object') return null;
  const known = bodyParserFault(err as Record<string, unknown>);
  if (known) return known;
  // The router throws a URIError (status 400) for a parameter it cannot decode.
  if (err instanceof URIError) return { status: 400, code: 'bad_path', message: 'The path is not valid percent-encoded UTF-8.' };
  const { status, expose } = err as { status?: unknown; expose?: unknown };
  if (expose === true && typeof status === 'number' && status >= 400 && status < 500) return { status, code: 'bad_request', message: 'The request could not be read.' };
  return null;
}

function send(res: Response, status: number, body: ApiErrorBody): void {
  if (res.headersSent) return;
  res.status(status).json(body);
}

/** The one error handler, registered last: AppErrors and client faults answer as themselves, the rest as 500. */
export function errorHandler(logger: Logger): ErrorRequestHandler {
  return (err, req, res, _next) => {
    err = databaseUnavailableError(err) ?? err;
    if (err instanceof AppError) {
      send(res, err.status, { error: { code: err.code, message: err.message, ...(err.fields ? { fields: err.fields } : {}) } });
      return;
    }
    const fault = clientFault(err);
    if (fault) {
      if (!res.headersSent && fault.headers) res.set(fault.headers);
      send(res, fault.status, { error: { code: fault.code, message: fault.message } });
      return;
    }
    logger.error({ err, method: req.method, url: req.originalUrl }, 'unhandled error');
    send(res, 500, { error: { code: 'internal', message: 'Something went wrong on the server; it has been logged.' } });
  };
}

/** 404 for any /api path no route answered. */
export const apiNotFound: RequestHandler = (req, _res, next) => {
  next(AppError.notFound(`No API route ${req.method} ${req.path}.`));
};
