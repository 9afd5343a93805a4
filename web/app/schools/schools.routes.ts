import type { Routes } from '@angular/router';
import { capabilityGuard } from '../core/auth/signed-in-guard';

export const schoolsRoutes: Routes = [
  {
    path: '',
    loadComponent: () => import('./school-list/school-list').then((m) => m.SchoolList),
    title: 'Schools · Tuttiboard',
  },
  {
    path: 'new',
    canActivate: [capabilityGuard],
    data: { capability: 'schools:write', id: 'new' },
    loadComponent: () => import('./school-detail/school-detail').then((m) => m.SchoolDetail),
    title: 'Add a school · Tuttiboard',
  },
  {
    path: ':id',
    loadComponent: () => import('./school-detail/school-detail').then((m) => m.SchoolDetail),
    title: 'School · Tuttiboard',
  },
];
