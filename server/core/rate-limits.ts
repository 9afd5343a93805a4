import { rateLimit, type RateLimitRequestHandler } from 'express-rate-limit';
import { createHash } from 'node:crypto';
import type { Request, RequestHandler } from 'express';

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
 * Failed token attempts per address per minute. Counted when a 401 goes out, never before the
 * answer: a limiter that counts every request up front and takes the good ones back when they
 * finish would refuse a busy client whose good requests happen to be in flight together.
 */
export function failedTokenLimit(failuresPerMinute = 30): RequestHandler {
  const failures = new Map<string, { count: number; resetAt: number }>();
  const current = (key: string, now: number) => {
    const entry = failures.get(key);
    if (entry && entry.resetAt <= now) failures.delete(key);
    return entry && entry.resetAt > now ? entry : undefined;
  };
  return (request, response, next) => {
    if (bearerOf(request) === undefined) return next();
    const key = request.ip ?? 'unknown';
    const entry = current(key, Date.now());
    if (entry && entry.count >= failuresPerMinute) {
      response.set('Retry-After', String(Math.ceil((entry.resetAt - Date.now()) / 1000)));
      response
        .status(429)
        .json(tooMany('Too many requests with a bad API token from this address. Wait a minute.'));
      return;
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
