import type { Routes } from '@angular/router';

/** The usage-fee ledger, refunds, reconciliation and the fee schedule. */
export const feesRoutes: Routes = [
  {
    path: '',
    loadComponent: () => import('./fees-page/fees-page').then((m) => m.FeesPage),
    title: 'Fees · Tuttiboard',
  },
];
