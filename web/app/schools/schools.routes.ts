import type { Routes } from '@angular/router';

export const schoolsRoutes: Routes = [
  {
    path: '',
    loadComponent: () => import('./school-list/school-list').then((m) => m.SchoolList),
    title: 'Schools · Tuttiboard',
  },
];
