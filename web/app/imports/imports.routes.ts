import type { Routes } from '@angular/router';

export const importsRoutes: Routes = [
  {
    path: '',
    loadComponent: () => import('./imports-page/imports-page').then((m) => m.ImportsPage),
    title: 'Imports · Tuttiboard',
  },
];
