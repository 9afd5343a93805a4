import type { Routes } from '@angular/router';
import { recordPageRoutes } from '../core/routing/record-page-routes';

/**
 * The roster's student pages. `/students/:id` itself is the student's progress page; the
 * record is edited at `/students/:id/edit`.
 */
export const studentsRoutes: Routes = recordPageRoutes({
  list: ['Students', () => import('./student-list/student-list').then((m) => m.StudentList)],
  detail: () => import('./student-detail/student-detail').then((m) => m.StudentDetail),
  create: ['Add a student', 'roster:write'],
  record: [':id/edit', 'Student record'],
});
