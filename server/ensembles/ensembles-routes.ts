import { Router } from 'express';
import { ensembleInputSchema, ensemblePatchSchema } from '@shared/api/ensemble';
import { actorOf, requires } from '../core/policy';
import { parseId, parseInput } from '../core/validate';
import type { Services } from '../services';
import { listEnsembles } from './ensembles-queries';
import { createEnsemble, deleteEnsemble, getEnsemble, updateEnsemble } from './ensembles-service';

/** `/api/ensembles`: read within the actor's schools; directors and the coordinator change. */
export function ensemblesRoutes({ db }: Services): Router {
  const router = Router();
  router.get('/ensembles', requires('roster:read'), async (request, response) => {
    response.json(await listEnsembles(db, actorOf(request), request.query));
  });
  router.get('/ensembles/:id', requires('roster:read'), async (request, response) => {
    response.json(await getEnsemble(db, actorOf(request), parseId(request.params['id'])));
  });
  router.post('/ensembles', requires('roster:write'), async (request, response) => {
    const input = parseInput(ensembleInputSchema, request.body, 'The ensemble');
    response.status(201).json(await createEnsemble(db, actorOf(request), input));
  });
  router.patch('/ensembles/:id', requires('roster:write'), async (request, response) => {
    const id = parseId(request.params['id']);
    const patch = parseInput(ensemblePatchSchema, request.body, 'The change');
    response.json(await updateEnsemble(db, actorOf(request), id, patch));
  });
  router.delete('/ensembles/:id', requires('roster:write'), async (request, response) => {
    await deleteEnsemble(db, actorOf(request), parseId(request.params['id']));
    response.status(204).end();
  });
  return router;
}
