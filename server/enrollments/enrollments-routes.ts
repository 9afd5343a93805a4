import { Router } from 'express';
import { enrollmentInputSchema, enrollmentPatchSchema } from '@shared/api/enrollment';
import { actorOf, requires } from '../core/policy';
import { parseId, parseInput } from '../core/validate';
import type { Services } from '../services';
import { listEnrollments } from './enrollments-queries';
import {
  createEnrollment,
  deleteEnrollment,
  getEnrollment,
  updateEnrollment,
} from './enrollments-service';

/** `/api/enrollments`: seats of students in ensembles, within the actor's schools. */
export function enrollmentsRoutes({ db }: Services): Router {
  const router = Router();
  router.get('/enrollments', requires('roster:read'), async (request, response) => {
    response.json(await listEnrollments(db, actorOf(request), request.query));
  });
  router.get('/enrollments/:id', requires('roster:read'), async (request, response) => {
    response.json(await getEnrollment(db, actorOf(request), parseId(request.params['id'])));
  });
  router.post('/enrollments', requires('roster:write'), async (request, response) => {
    const input = parseInput(enrollmentInputSchema, request.body, 'The enrollment');
    response.status(201).json(await createEnrollment(db, actorOf(request), input));
  });
  router.patch('/enrollments/:id', requires('roster:write'), async (request, response) => {
    const id = parseId(request.params['id']);
    const patch = parseInput(enrollmentPatchSchema, request.body, 'The change');
    response.json(await updateEnrollment(db, actorOf(request), id, patch));
  });
  router.delete('/enrollments/:id', requires('roster:write'), async (request, response) => {
    await deleteEnrollment(db, actorOf(request), parseId(request.params['id']));
    response.status(204).end();
  });
  return router;
}
