import { rateLimit, type RateLimitRequestHandler } from 'express-rate-limit';
import { createHash } from 'node:crypto';
import type { Request, RequestHandler } from 'express';
import type { ErrorBody } from '@shared/api/error-body';
import { HttpError } from './errors';

const windowMs = 60_000;

function tooMany(message: string): ErrorBody {
  return { error: { status: 429, code: 'too_many_requests', message, fieldErrors: [] } };
}

/** Sign-in attempts per address per minute: enough for a staff room, too few for guessing. */
export function signInLimit(perMinute = 40): RateLimitRequestHandler {
  return rateLimit({
    windowMs,
    limit: perMinute,
    standardHeaders: 'draft-7',
    legacyHeaders: false,
    message: tooMany('Too many sign-in attempts from this address. Wait a minute and try again.'),
  });
}

function bearerOf(request: Request): string | undefined {
  const header = request.get('authorization');
  return header?.toLowerCase().startsWith('bearer ') ? header.slice(7).trim() : undefined;
}

/** Set on `response.locals` when the address has used up its failed-token attempts. */
export const tokenFailuresExceeded = 'tokenFailuresExceeded';

/** The 429 a bad token from an address over its limit answers with. */
export function tooManyTokenFailures(): HttpError {
  return new HttpError(
    429,
    'too_many_requests',
    'Too many requests with a bad API token from this address. Wait a minute.',
  );
}

/**
 * Failed token attempts per address per minute. Only failures are counted (when a 401 goes
 * out, never before the answer), and only a failing token is refused once the address is over
 * the limit: a school's staff share one address behind their router, so a good token keeps
 * working whatever a colleague's script got wrong. `authenticate` reads the mark this leaves on
 * `response.locals` when a token does not resolve.
 */
export function failedTokenLimit(failuresPerMinute = 30): RequestHandler {
  const failures = new Map<string, { count: number; resetAt: number }>();
  const current = (key: string, now: number) => {
    const entry = failures.get(key);
    if (entry && entry.resetAt <= now) failures.delete(key);
    return entry && entry.resetAt > now ? entry : undefined;
  };
  return (request, response, next) => {
    if (request.get('authorization') === undefined) return next();
    const key = request.ip ?? 'unknown';
    const entry = current(key, Date.now());
    if (entry && entry.count >= failuresPerMinute) {
      response.locals[tokenFailuresExceeded] = Math.ceil((entry.resetAt - Date.now()) / 1000);
    }
    response.on('finish', () => {
      if (response.statusCode !== 401) return;
      const now = Date.now();
      const counted = current(key, now);
      if (counted) counted.count += 1;
      else failures.set(key, { count: 1, resetAt: now + windowMs });
      // Addresses that stopped failing are forgotten once their minute is over.
      if (failures.size > 10_000) for (const [stale] of failures) current(stale, now);
    });
    next();
  };
}

/**
 * Token use per token per minute, and failed token attempts per address, so a leaked or
 * guessed token cannot be hammered against the API.
 */
export function tokenLimits(perMinute = 1200, failuresPerMinute = 30): RequestHandler[] {
  return [
    rateLimit({
      windowMs,
      limit: perMinute,
      standardHeaders: 'draft-7',
      legacyHeaders: false,
      skip: (request) => bearerOf(request) === undefined,
      keyGenerator: (request) => createHash('sha256').update(bearerOf(request)!).digest('hex'),
      message: tooMany('This API token made too many requests this minute. Slow down and retry.'),
    }),
    failedTokenLimit(failuresPerMinute),
  ];
}
