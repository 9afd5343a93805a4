import type { Routes } from '@angular/router';
import { capabilityGuard } from '../core/auth/signed-in-guard';
import { ReportsPage } from './reports-page/reports-page';

/** `/reports`: preview and send, schedules (coordinator), reports sent, and the outbox. */
export const reportsRoutes: Routes = [
  {
    path: '',
    component: ReportsPage,
    children: [
      {
        path: '',
        pathMatch: 'full',
        loadComponent: () =>
          import('./report-composer/report-composer').then((m) => m.ReportComposer),
        title: 'Reports · Tuttiboard',
      },
      {
        path: 'schedules',
        canActivate: [capabilityGuard],
        data: { capability: 'reports:send' },
        loadComponent: () =>
          import('./report-schedules/report-schedules').then((m) => m.ReportSchedules),
        title: 'Report schedules · Tuttiboard',
      },
      {
        path: 'sent',
        loadComponent: () => import('./report-runs/report-runs').then((m) => m.ReportRuns),
        title: 'Reports sent · Tuttiboard',
      },
      {
        path: 'outbox',
        canActivate: [capabilityGuard],
        data: { capability: 'outbox:read' },
        loadComponent: () => import('./outbox-list/outbox-list').then((m) => m.OutboxList),
        title: 'Outbox · Tuttiboard',
      },
      {
        path: 'outbox/:id',
        canActivate: [capabilityGuard],
        data: { capability: 'outbox:read' },
        loadComponent: () => import('./outbox-message/outbox-message').then((m) => m.OutboxMessage),
        title: 'Outbox message · Tuttiboard',
      },
    ],
  },
];
