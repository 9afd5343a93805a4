import type { Routes } from '@angular/router';

/** The replacement plan and shortages page. */
export const planningRoutes: Routes = [
  {
    path: '',
    loadComponent: () => import('./planning-page/planning-page').then((m) => m.PlanningPage),
    title: 'Replacement plan · Tuttiboard',
  },
];
