import { Router } from 'express';
import { personInputSchema, personPatchSchema } from '@shared/api/person';
import { requires } from '../core/policy';
import { answer, recordRoutes } from '../core/routes';
import type { Services } from '../services';
import { listAudit } from './people-queries';
import { createPerson, getPerson, listPeople, updatePerson } from './people-service';

/**
 * `/api/users` and `/api/audit`: the coordinator manages who signs in and reads who changed
 * what. There is no DELETE: a person is deactivated, so the audit log keeps their name.
 */
export function peopleRoutes({ db }: Services): Router {
  const router = recordRoutes(
    db,
    {
      path: '/users',
      capabilities: ['people:manage', 'people:manage'],
      input: [personInputSchema, 'The person'],
      patch: personPatchSchema,
    },
    {
      list: (db, _actor, query) => listPeople(db, query),
      get: (db, _actor, id) => getPerson(db, id),
      create: createPerson,
      update: updatePerson,
    },
  );
  router.get(
    '/audit',
    requires('people:manage'),
    answer((request) => listAudit(db, request.query)),
  );
  return router;
}
