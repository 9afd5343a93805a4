import { nothing, parseInput } from '../core/validate';
import { Router } from 'express';
import { actorOf } from '../core/policy';
import type { Services } from '../services';
import { describeMe } from './me-service';
import { noteSignedIn } from '../auth/signed-in-cookie';

/** `GET /api/me`: who is signed in, their role and schools. */
export function meRoutes({ db }: Services): Router {
  const router = Router();
  router.get('/me', async (request, response) => {
    parseInput(nothing, request.query, 'The query');
    const actor = actorOf(request);
    const me = await describeMe(db, actor);
    // A session's user, named for the web app's copy of the last visit (not for a bearer token).
    if (actor.via === 'session') noteSignedIn(request, response, actor.userId);
    response.json(me);
  });
  return router;
}
