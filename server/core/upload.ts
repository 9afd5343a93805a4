import type { RequestHandler } from 'express';
import multer from 'multer';
import { HttpError } from './errors';

/**
 * One file in a multipart/form-data body (RFC 7578), kept in memory; multer's own refusals
 * (multer README, "Error handling") are answered as the API's errors by `refuse`, anything else
 * goes on to the error handler.
 */
export function singleUpload(
  field: string,
  limits: multer.Options['limits'],
  refuse: (error: multer.MulterError) => HttpError,
): RequestHandler {
  const single = multer({ storage: multer.memoryStorage(), limits }).single(field);
  return (request, response, next) => {
    single(request, response, (error: unknown) => {
      if (!error) return next();
      next(error instanceof multer.MulterError ? refuse(error) : error);
    });
  };
}

/**
 * A recording's upload (a pass-off's or a take's): too large is 413, any other refusal 400,
 * each naming the `recording` field.
 */
export function recordingUpload(
  limits: multer.Options['limits'],
  tooLargeMessage: string,
): RequestHandler {
  return singleUpload('recording', limits, (error) => {
    const tooLarge = error.code === 'LIMIT_FILE_SIZE';
    return new HttpError(
      tooLarge ? 413 : 400,
      tooLarge ? 'too_large' : 'bad_request',
      tooLarge ? tooLargeMessage : `The upload was not understood: ${error.message}.`,
      [
        {
          field: 'recording',
          message: tooLarge ? 'The file is larger than 10 MB.' : error.message,
        },
      ],
    );
  });
}
