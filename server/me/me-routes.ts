import { nothing, parseInput } from '../core/validate';
import { Router } from 'express';
import type { Me } from '@shared/api/me';
import { actorOf, capabilitiesOf, seesAllSchools } from '../core/policy';
import type { Services } from '../services';
import { schoolsOf } from '../people/people-queries';
import { noteSignedIn } from '../auth/signed-in-cookie';

/** `GET /api/me`: who is signed in, their role and schools. */
export function meRoutes({ db }: Services): Router {
  const router = Router();
  router.get('/me', async (request, response) => {
    parseInput(nothing, request.query, 'The query');
    const actor = actorOf(request);
    const me: Me = {
      id: actor.userId,
      email: actor.email,
      name: actor.name,
      role: actor.role,
      allSchools: seesAllSchools(actor),
      schools: await schoolsOf(db, actor),
      studentId: actor.studentId,
      capabilities: capabilitiesOf(actor.role),
    };
    // A session's user, named for the web app's copy of the last visit (not for a bearer token).
    if (actor.via === 'session') noteSignedIn(request, response, actor.userId);
    response.json(me);
  });
  return router;
}
