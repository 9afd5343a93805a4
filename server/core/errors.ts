import type { FieldError } from '@shared/api/error-body';

export type { FieldError };

/** An error that answers with its own HTTP status and the stable JSON error shape. */
export class HttpError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly fieldErrors: FieldError[] = [],
  ) {
    super(message);
  }
}

export const notFound = (what = 'That record') =>
  new HttpError(
    404,
    'not_found',
    `${what} was not found, or is outside the schools you work with.`,
  );

export const forbidden = (message = 'Your role does not allow this.') =>
  new HttpError(403, 'forbidden', message);

export const unauthenticated = () =>
  new HttpError(
    401,
    'unauthenticated',
    'Sign in first: this needs a signed-in user or an API token.',
  );

export const badRequest = (message: string, fieldErrors: FieldError[] = []) =>
  new HttpError(400, 'bad_request', message, fieldErrors);

export const conflict = (
  message = 'Someone else changed this record since you opened it. Reload it and make your change again.',
) => new HttpError(409, 'conflict', message);
