import type { Router } from 'express';
import { ensembleInputSchema, ensemblePatchSchema } from '@shared/api/ensemble';
import { recordRoutes } from '../core/routes';
import type { Services } from '../services';
import { listEnsembles } from './ensembles-queries';
import { createEnsemble, deleteEnsemble, getEnsemble, updateEnsemble } from './ensembles-service';

/** `/api/ensembles`: read within the actor's schools; directors and the coordinator change. */
export function ensemblesRoutes({ db }: Services): Router {
  return recordRoutes(
    db,
    {
      path: '/ensembles',
      capabilities: ['roster:read', 'roster:write'],
      input: [ensembleInputSchema, 'The ensemble'],
      patch: ensemblePatchSchema,
    },
    {
      list: listEnsembles,
      get: getEnsemble,
      create: createEnsemble,
      update: updateEnsemble,
      remove: deleteEnsemble,
    },
  );
}
