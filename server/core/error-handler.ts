import type { ErrorRequestHandler, RequestHandler } from 'express';
import type { Logger } from '../logger';
import { HttpError } from './errors';

/** The JSON every failed API call answers with. */
export interface ErrorBody {
  error: { status: number; code: string; message: string; fieldErrors: { field: string; message: string }[] };
}

/** 404 for API paths no router answered. */
export const unknownApiRoute: RequestHandler = (request, _response, next) => {
  next(new HttpError(404, 'no_such_route', `There is no API route ${request.method} ${request.path}.`));
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
    } else {
      logger.error({ err: error, method: request.method, path: request.path }, 'unexpected error');
      httpError = new HttpError(500, 'internal', 'Something went wrong on the server; nothing was changed by the failed step. Try again, and tell the coordinator if it goes on.');
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
