import type { NextFunction, Request, Response } from 'express';
import type { Database } from '../db/client';
import { HttpError } from '../core/errors';
import { loadActor } from '../people/people-queries';
import { resolveToken } from '../tokens/token-service';
import type { SessionUser } from './oidc-sign-in';

const badToken = () =>
  new HttpError(401, 'bad_token', 'This API token is not valid or has been revoked.');

/**
 * Sets `request.actor` from a bearer token or the session. A bad or revoked token answers 401
 * at once rather than falling back to the session: a script should learn its token is dead.
 */
export function authenticate(db: Database) {
  return async (request: Request, _response: Response, next: NextFunction) => {
    const header = request.get('authorization');
    if (header !== undefined) {
      const match = /^Bearer\s+(\S+)\s*$/i.exec(header);
      if (!match) {
        throw new HttpError(401, 'bad_token', "The Authorization header must be 'Bearer <token>'.");
      }
      const actor = await resolveToken(db, match[1]!);
      if (!actor) throw badToken();
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
