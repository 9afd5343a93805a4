import type { Router } from 'express';
import { personInputSchema, personPatchSchema } from '@shared/api/person';
import { requires } from '../core/policy';
import { answer, recordRoutes, withoutActor } from '../core/routes';
import type { Services } from '../services';
import { listAudit } from './people-queries';
import { createPerson, getPerson, listPeople, updatePerson } from './people-service';

/** `/api/users`: people and their details are the coordinator's alone, not scoped by school. */
const users = recordRoutes('/users', {
  read: ['people:manage', withoutActor(listPeople), withoutActor(getPerson)],
  create: ['people:manage', personInputSchema, 'The person', createPerson],
  update: ['people:manage', personPatchSchema, updatePerson],
});

/**
 * `/api/users` and `/api/audit`: the coordinator manages who signs in and reads who changed
 * what. There is no DELETE: a person is deactivated, so the audit log keeps their name.
 */
export function peopleRoutes(services: Services): Router {
  const router = users(services);
  const { db } = services;
  router.get(
    '/audit',
    requires('people:manage'),
    answer((request) => listAudit(db, request.query)),
  );
  return router;
}
