import type { NextFunction, Request, Response } from 'express';
import type { Database } from '../db/client';
import { HttpError } from '../core/errors';
import { tokenFailuresExceeded, tooManyTokenFailures } from '../core/rate-limits';
import { loadActor } from '../people/people-queries';
import { resolveToken } from '../tokens/tokens-service';
import type { SessionUser } from './oidc-sign-in';

/**
 * The answer to a token that does not resolve: 401, or 429 once the address has sent too many
 * bad ones this minute (server/core/rate-limits.ts counts them).
 */
function refuseToken(response: Response, error: HttpError): HttpError {
  const retryAfter = response.locals[tokenFailuresExceeded] as number | undefined;
  if (retryAfter === undefined) return error;
  response.set('Retry-After', String(retryAfter));
  return tooManyTokenFailures();
}

const badToken = () =>
  new HttpError(401, 'bad_token', 'This API token is not valid, has expired or has been revoked.');

/**
 * Sets `request.actor` from a bearer token or the session. A bad or revoked token answers 401
 * at once rather than falling back to the session: a script should learn its token is dead.
 */
export function authenticate(db: Database) {
  return async (request: Request, response: Response, next: NextFunction) => {
    const header = request.get('authorization');
    if (header !== undefined) {
      const match = /^Bearer\s+(\S+)\s*$/i.exec(header);
      if (!match) {
        throw refuseToken(
          response,
          new HttpError(401, 'bad_token', "The Authorization header must be 'Bearer <token>'."),
        );
      }
      const actor = await resolveToken(db, match[1]!);
      if (!actor) throw refuseToken(response, badToken());
      request.actor = actor;
      return next();
    }
    const sessionUser = request.user as SessionUser | undefined;
    if (sessionUser?.userId) {
      const actor = await loadActor(db, sessionUser.userId, 'session');
      if (actor) request.actor = actor;
    }
    next();
  };
}
