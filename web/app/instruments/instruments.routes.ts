import type { Routes } from '@angular/router';

/** The fleet's pages: the grid of instruments and each instrument's page. */
export const instrumentsRoutes: Routes = [
  {
    path: '',
    loadComponent: () => import('./instrument-list/instrument-list').then((m) => m.InstrumentList),
    title: 'Instruments · Tuttiboard',
  },
  {
    path: ':id',
    loadComponent: () =>
      import('./instrument-detail/instrument-detail').then((m) => m.InstrumentDetail),
    title: 'Instrument · Tuttiboard',
  },
];
