import type { Routes } from '@angular/router';

export const peopleRoutes: Routes = [
  {
    path: '',
    loadComponent: () => import('./people-page/people-page').then((m) => m.PeoplePage),
    title: 'People · Tuttiboard',
  },
];
