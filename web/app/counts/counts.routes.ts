import type { Routes } from '@angular/router';

/** The annual count: past and open counts, and one count's scanning page. */
export const countsRoutes: Routes = [
  {
    path: '',
    loadComponent: () => import('./count-list/count-list').then((m) => m.CountList),
    title: 'Annual count · Tuttiboard',
  },
  {
    path: ':id',
    loadComponent: () => import('./count-session/count-session').then((m) => m.CountSession),
    title: 'Count · Tuttiboard',
  },
];
