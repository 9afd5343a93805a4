import type { Routes } from '@angular/router';
import { capabilityGuard } from '../core/auth/signed-in-guard';

/** The scale ladder: everyone reads the version in force; the coordinator edits drafts. */
export const ladderRoutes: Routes = [
  {
    path: '',
    loadComponent: () => import('./ladder-view/ladder-view').then((m) => m.LadderView),
    title: 'Scale ladder · Tuttiboard',
  },
  {
    path: 'versions/:id/edit',
    canActivate: [capabilityGuard],
    data: { capability: 'ladder:write' },
    loadComponent: () => import('./ladder-editor/ladder-editor').then((m) => m.LadderEditor),
    title: 'Edit a draft ladder · Tuttiboard',
  },
];
