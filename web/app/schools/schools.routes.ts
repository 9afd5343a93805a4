import type { Routes } from '@angular/router';
import { recordPageRoutes } from '../core/routing/record-page-routes';

export const schoolsRoutes: Routes = recordPageRoutes({
  list: ['Schools', () => import('./school-list/school-list').then((m) => m.SchoolList)],
  detail: () => import('./school-detail/school-detail').then((m) => m.SchoolDetail),
  create: ['Add a school', 'schools:write'],
  record: [':id', 'School'],
});
