import { createHash } from 'node:crypto';
import type { RequestHandler } from 'express';
import { invalidParameter, ServiceError } from './payment-objects.js';

const idempotencyWindowMs = 24 * 60 * 60 * 1000;

/**
 * Idempotency: the same key with the same request answers what it answered the first time; the
 * same key with other parameters is an error. Keys are kept for a day.
 */
export function idempotentRequests(): RequestHandler {
  const idempotency = new Map<
    string,
    { fingerprint: string; status: number; body: unknown; at: number }
  >();
  return (request, response, next) => {
    const key = request.headers['idempotency-key'];
    if (request.method !== 'POST' || typeof key !== 'string') return next();
    if (key.length > 255)
      throw invalidParameter('Idempotency-Key', 'Idempotency keys are at most 255 characters.');
    const fingerprint = createHash('sha256')
      .update(`${request.path}\n${JSON.stringify(request.body ?? {})}`)
      .digest('hex');
    const now = Date.now();
    for (const [stored, entry] of idempotency)
      if (now - entry.at > idempotencyWindowMs) idempotency.delete(stored);
    const earlier = idempotency.get(key);
    if (earlier) {
      if (earlier.fingerprint !== fingerprint) {
        throw new ServiceError(
          400,
          'idempotency_error',
          `Keys for idempotent requests can only be used with the same parameters they were first used with. Try using a key other than '${key}' if you meant to execute a different request.`,
        );
      }
      response
        .set('Idempotent-Replayed', 'true')
        .set('Idempotency-Key', key)
        .status(earlier.status)
        .json(earlier.body);
      return;
    }
    const json = response.json.bind(response);
    response.json = (body: unknown) => {
      // Answers to bad parameters are not kept (the service keeps only requests that began executing).
      if (response.statusCode < 400 || response.statusCode >= 500)
        idempotency.set(key, { fingerprint, status: response.statusCode, body, at: now });
      response.set('Idempotency-Key', key);
      return json(body);
    };
    next();
  };
}
