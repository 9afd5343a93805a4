import type { Routes } from '@angular/router';
import { capabilityGuard } from '../core/auth/signed-in-guard';

/**
 * The roster's student pages. `/students/:id` itself is the student's progress page; the
 * record is edited at `/students/:id/edit`.
 */
export const studentsRoutes: Routes = [
  {
    path: '',
    loadComponent: () => import('./student-list/student-list').then((m) => m.StudentList),
    title: 'Students · Tuttiboard',
  },
  {
    path: 'new',
    canActivate: [capabilityGuard],
    data: { capability: 'roster:write', id: 'new' },
    loadComponent: () => import('./student-detail/student-detail').then((m) => m.StudentDetail),
    title: 'Add a student · Tuttiboard',
  },
  {
    path: ':id/edit',
    loadComponent: () => import('./student-detail/student-detail').then((m) => m.StudentDetail),
    title: 'Student record · Tuttiboard',
  },
];
