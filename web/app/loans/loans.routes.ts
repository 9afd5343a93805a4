import { inject } from '@angular/core';
import type { CanActivateFn, Routes } from '@angular/router';
import { CurrentUser } from '../core/auth/current-user';

/** Staff with `loans:read` see their schools' loans; a student (`self:read`) their own. */
const loansGuard: CanActivateFn = async () => {
  const currentUser = inject(CurrentUser);
  await currentUser.load();
  return currentUser.can('loans:read') || currentUser.can('self:read');
};

/** The loans page. */
export const loansRoutes: Routes = [
  {
    path: '',
    canActivate: [loansGuard],
    loadComponent: () => import('./loans-page/loans-page').then((m) => m.LoansPage),
    title: 'Loans · Tuttiboard',
  },
];
