import { Router } from 'express';
import { schoolInputSchema, schoolPatchSchema } from '@shared/api/school';
import { actorOf, requires } from '../core/policy';
import { parseId, parseInput } from '../core/validate';
import type { Services } from '../services';
import {
  createSchool,
  deleteSchool,
  getSchool,
  listSchools,
  updateSchool,
} from './schools-service';

/** `/api/schools`: everyone with a school view reads; the coordinator changes. */
export function schoolsRoutes({ db }: Services): Router {
  const router = Router();
  router.get('/schools', requires('schools:read'), async (request, response) => {
    response.json(await listSchools(db, actorOf(request), request.query));
  });
  router.get('/schools/:id', requires('schools:read'), async (request, response) => {
    response.json(await getSchool(db, actorOf(request), parseId(request.params['id'])));
  });
  router.post('/schools', requires('schools:write'), async (request, response) => {
    const input = parseInput(schoolInputSchema, request.body, 'The school');
    response.status(201).json(await createSchool(db, actorOf(request), input));
  });
  router.patch('/schools/:id', requires('schools:write'), async (request, response) => {
    const id = parseId(request.params['id']);
    const patch = parseInput(schoolPatchSchema, request.body, 'The change');
    response.json(await updateSchool(db, actorOf(request), id, patch));
  });
  router.delete('/schools/:id', requires('schools:write'), async (request, response) => {
    await deleteSchool(db, actorOf(request), parseId(request.params['id']));
    response.status(204).end();
  });
  return router;
}
