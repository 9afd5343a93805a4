import type { Routes } from '@angular/router';
import { recordPageRoutes } from '../core/routing/record-page-routes';

export const ensemblesRoutes: Routes = recordPageRoutes({
  list: ['Ensembles', () => import('./ensemble-list/ensemble-list').then((m) => m.EnsembleList)],
  detail: () => import('./ensemble-detail/ensemble-detail').then((m) => m.EnsembleDetail),
  create: ['Add an ensemble', 'roster:write'],
  record: [':id', 'Ensemble'],
});
