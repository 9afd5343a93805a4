import { nothing, parseInput } from '../core/validate';
import { Router } from 'express';
import type { Me } from '@shared/api/me';
import { actorOf, capabilitiesOf, seesAllSchools } from '../core/policy';
import type { Services } from '../services';
import { schoolsOf } from '../people/people-queries';

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
    response.json(me);
  });
  return router;
}
