import type { Routes } from '@angular/router';

export const schoolYearsRoutes: Routes = [
  {
    path: '',
    loadComponent: () =>
      import('./school-years-page/school-years-page').then((m) => m.SchoolYearsPage),
    title: 'School years · Tuttiboard',
  },
];
