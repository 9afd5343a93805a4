import { nothing, parseInput } from '../core/validate';
import { Router } from 'express';
import { actorOf } from '../core/policy';
import type { Services } from '../services';
import { describeMe } from './me-service';

/** `GET /api/me`: who is signed in, their role and schools. */
export function meRoutes({ db }: Services): Router {
  const router = Router();
  router.get('/me', async (request, response) => {
    parseInput(nothing, request.query, 'The query');
    response.json(await describeMe(db, actorOf(request)));
  });
  return router;
}
