import type { Routes } from '@angular/router';

/** The repair tickets page. */
export const repairsRoutes: Routes = [
  {
    path: '',
    loadComponent: () => import('./repair-list/repair-list').then((m) => m.RepairList),
    title: 'Repairs · Tuttiboard',
  },
];
