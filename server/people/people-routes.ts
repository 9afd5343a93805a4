import { Router } from 'express';
import { personInputSchema, personPatchSchema } from '@shared/api/person';
import { actorOf, requires } from '../core/policy';
import { parseId, parseInput } from '../core/validate';
import type { Services } from '../services';
import { listAudit } from './people-queries';
import { createPerson, getPerson, listPeople, updatePerson } from './people-service';

/**
 * `/api/users` and `/api/audit`: the coordinator manages who signs in and reads who changed
 * what. There is no DELETE: a person is deactivated, so the audit log keeps their name.
 */
export function peopleRoutes({ db }: Services): Router {
  const router = Router();
  router.get('/users', requires('people:manage'), async (request, response) => {
    response.json(await listPeople(db, request.query));
  });
  router.get('/users/:id', requires('people:manage'), async (request, response) => {
    response.json(await getPerson(db, parseId(request.params['id'])));
  });
  router.post('/users', requires('people:manage'), async (request, response) => {
    const input = parseInput(personInputSchema, request.body, 'The person');
    response.status(201).json(await createPerson(db, actorOf(request), input));
  });
  router.patch('/users/:id', requires('people:manage'), async (request, response) => {
    const id = parseId(request.params['id']);
    const patch = parseInput(personPatchSchema, request.body, 'The change');
    response.json(await updatePerson(db, actorOf(request), id, patch));
  });
  router.get('/audit', requires('people:manage'), async (request, response) => {
    response.json(await listAudit(db, request.query));
  });
  return router;
}
