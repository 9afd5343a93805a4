import { rateLimit, type RateLimitRequestHandler } from 'express-rate-limit';
import { createHash } from 'node:crypto';
import type { Request } from 'express';

const windowMs = 60_000;

function tooMany(message: string) {
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

/**
 * Token use per token per minute, and failed token attempts per address, so a leaked or
 * guessed token cannot be hammered against the API.
 */
export function tokenLimits(perMinute = 1200, failuresPerMinute = 30): RateLimitRequestHandler[] {
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
    rateLimit({
      windowMs,
      limit: failuresPerMinute,
      standardHeaders: 'draft-7',
      legacyHeaders: false,
      skip: (request) => bearerOf(request) === undefined,
      skipSuccessfulRequests: true,
      requestWasSuccessful: (_request, response) => response.statusCode !== 401,
      message: tooMany('Too many requests with a bad API token from this address. Wait a minute.'),
    }),
  ];
}
