import { ensembleInputSchema, ensemblePatchSchema } from '@shared/api/ensemble';
import { recordRoutes } from '../core/routes';
import { listEnsembles } from './ensembles-queries';
import { createEnsemble, deleteEnsemble, getEnsemble, updateEnsemble } from './ensembles-service';

/** `/api/ensembles`: read within the actor's schools; directors and the coordinator change. */
export const ensemblesRoutes = recordRoutes('/ensembles', {
  read: ['roster:read', listEnsembles, getEnsemble],
  create: ['roster:write', ensembleInputSchema, 'The ensemble', createEnsemble],
  update: ['roster:write', ensemblePatchSchema, updateEnsemble],
  remove: ['roster:write', deleteEnsemble],
});
