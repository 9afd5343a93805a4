import { inject } from '@angular/core';
import { Router, type CanActivateFn, type Routes } from '@angular/router';
import { CurrentUser } from '../core/auth/current-user';
import { provideCharts } from '../core/charts/chart-provider';

/** A student has their own progress page instead of the Overview. */
const notForStudents: CanActivateFn = async () => {
  const currentUser = inject(CurrentUser);
  const router = inject(Router);
  const me = await currentUser.load();
  if (me?.role !== 'student') return true;
  return router.parseUrl(me.studentId ? `/students/${me.studentId}` : '/practice');
};

/** The Overview; ECharts is provided here so it loads with this route only. */
export const overviewRoutes: Routes = [
  {
    path: '',
    canActivate: [notForStudents],
    providers: [provideCharts()],
    loadComponent: () => import('./overview').then((m) => m.Overview),
    title: 'Overview · Tuttiboard',
  },
];
