import type { ErrorBody } from '@shared/api/error-body';
import type { ErrorRequestHandler, RequestHandler } from 'express';
import type { Logger } from '../logger';
import { HttpError } from './errors';

export type { ErrorBody };

/** 404 for API paths no router answered. */
export const unknownApiRoute: RequestHandler = (request, _response, next) => {
  next(
    new HttpError(404, 'no_such_route', `There is no API route ${request.method} ${request.path}.`),
  );
};

/** Turns any error into the stable JSON shape; unexpected ones are logged and answer 500. */
export function errorHandler(logger: Logger): ErrorRequestHandler {
  return (error: unknown, request, response, _next) => {
    let httpError: HttpError;
    if (error instanceof HttpError) {
      httpError = error;
    } else if (isBodyParserError(error)) {
      httpError = new HttpError(
        error.status,
        error.type === 'entity.too.large' ? 'too_large' : 'bad_request',
        error.type === 'entity.too.large'
          ? 'The request is too large.'
          : 'The request body is not valid JSON.',
      );
    } else if (dataException(error)) {
      // The shared input rules should have refused this value; log the gap and answer 400.
      logger.warn(
        { err: error, method: request.method, path: request.path },
        'value the database refused',
      );
      httpError = new HttpError(
        400,
        'bad_request',
        'A value in the request is outside what can be stored (a number too large, a date out of range or a control character in text). Nothing was changed.',
      );
    } else if (storageRefusal(error)) {
      logger.error({ err: error, method: request.method, path: request.path }, 'database refused');
      httpError = new HttpError(
        503,
        'database_unavailable',
        "The database cannot take changes right now (disk full or read-only). Nothing was changed; tell the district's IT.",
      );
    } else {
      logger.error({ err: error, method: request.method, path: request.path }, 'unexpected error');
      httpError = new HttpError(
        500,
        'internal',
        'Something went wrong on the server; nothing was changed by the failed step. Try again, and tell the coordinator if it goes on.',
      );
    }
    if (response.headersSent) return;
    const body: ErrorBody = {
      error: {
        status: httpError.status,
        code: httpError.code,
        message: httpError.message,
        fieldErrors: httpError.fieldErrors,
      },
    };
    response.status(httpError.status).json(body);
  };
}

/**
 * Whether a PostgreSQL error (PGlite's or a server's, possibly wrapped by Drizzle in `cause`)
 * says the storage refused: class 53 "insufficient resources" (53100 disk_full), 25006
 * read_only_sql_transaction, or 42501, which PostgreSQL reports when the data folder's files
 * cannot be opened for permission or read-only file system reasons.
 */
function storageRefusal(error: unknown): boolean {
  // PostgreSQL 18 documentation, Appendix A "PostgreSQL Error Codes"; the file-access mapping of
  // EACCES and EROFS to 42501 is errcode_for_file_access() in src/backend/utils/error/elog.c.
  for (let cause = error, depth = 0; cause && depth < 5; depth += 1) {
    const code = (cause as { code?: unknown }).code;
    if (typeof code === 'string' && /^(53...|25006|42501)$/.test(code)) return true;
    cause = (cause as { cause?: unknown }).cause;
  }
  return false;
}

/**
 * Whether a PostgreSQL error is class 22 "data exception" (22003 numeric value out of range,
 * 22008 datetime field overflow, 22021 character not in repertoire, …): a value, not the server,
 * is at fault (PostgreSQL 18 documentation, Appendix A).
 */
function dataException(error: unknown): boolean {
  for (let cause = error, depth = 0; cause && depth < 5; depth += 1) {
    const code = (cause as { code?: unknown }).code;
    if (typeof code === 'string' && /^22...$/.test(code)) return true;
    cause = (cause as { cause?: unknown }).cause;
  }
  return false;
}

function isBodyParserError(error: unknown): error is { status: number; type: string } {
  return (
    typeof error === 'object' &&
    error !== null &&
    'type' in error &&
    'status' in error &&
    typeof (error as { status: unknown }).status === 'number' &&
    (error as { status: number }).status < 500
  );
}
