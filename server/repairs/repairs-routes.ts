import { Router } from 'express';
import { repairInputSchema, repairPatchSchema } from '@shared/api/repair';
import { actorOf, requires } from '../core/policy';
import { parseId, parseInput } from '../core/validate';
import type { Services } from '../services';
import { createRepair, findRepair, listRepairs, updateRepair } from './repairs-service';

/** `/api/repairs`: everyone with a fleet view reads; technicians and the coordinator write. */
export function repairsRoutes({ db }: Services): Router {
  const router = Router();
  router.get('/repairs', requires('fleet:read'), async (request, response) => {
    response.json(await listRepairs(db, actorOf(request), request.query));
  });
  router.get('/repairs/:id', requires('fleet:read'), async (request, response) => {
    response.json(await findRepair(db, actorOf(request), parseId(request.params['id'])));
  });
  router.post('/repairs', requires('repairs:write'), async (request, response) => {
    const input = parseInput(repairInputSchema, request.body, 'The repair ticket');
    response.status(201).json(await createRepair(db, actorOf(request), input));
  });
  router.patch('/repairs/:id', requires('repairs:write'), async (request, response) => {
    const id = parseId(request.params['id']);
    const patch = parseInput(repairPatchSchema, request.body, 'The change');
    response.json(await updateRepair(db, actorOf(request), id, patch));
  });
  return router;
}
