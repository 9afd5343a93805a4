import type { Routes } from '@angular/router';
import { capabilityGuard } from '../core/auth/signed-in-guard';

export const ensemblesRoutes: Routes = [
  {
    path: '',
    loadComponent: () => import('./ensemble-list/ensemble-list').then((m) => m.EnsembleList),
    title: 'Ensembles · Tuttiboard',
  },
  {
    path: 'new',
    canActivate: [capabilityGuard],
    data: { capability: 'roster:write', id: 'new' },
    loadComponent: () => import('./ensemble-detail/ensemble-detail').then((m) => m.EnsembleDetail),
    title: 'Add an ensemble · Tuttiboard',
  },
  {
    path: ':id',
    loadComponent: () => import('./ensemble-detail/ensemble-detail').then((m) => m.EnsembleDetail),
    title: 'Ensemble · Tuttiboard',
  },
];
