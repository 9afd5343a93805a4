import type { CanMatchFn, Routes } from '@angular/router';
import { capabilityGuard, signedInGuard } from './core/auth/signed-in-guard';
import { startPage } from './core/start-page';
import { startEntryReads } from './pass-offs/pass-off-entry/entry-reads';
import {
  studentPageGuard,
  studentPageMatcher,
} from './students/student-progress/student-page-route';

const loadShell = () => import('./core/layout/shell').then((m) => m.Shell);

const loadPassOffEntry = () =>
  import('./pass-offs/pass-off-entry/pass-off-entry').then((m) => m.PassOffEntry);

/**
 * A `canMatch` guard that only starts a route's lazy code loading and lets the route match:
 * Angular's router runs `canMatch` while it recognizes the URL, before the parent's `canActivate`
 * guards, and loads `loadComponent` only after them. A failed load is left to `loadComponent`.
 */
function startLoading(load: () => Promise<unknown>): CanMatchFn {
  return () => {
    load().catch(() => undefined);
    return true;
  };
}

export const routes: Routes = [
  {
    path: 'signed-out',
    loadComponent: () => import('./signed-out/signed-out').then((m) => m.SignedOut),
    title: 'Signed out · Tuttiboard',
  },
  {
    path: '',
    // The shell (top bar, navigation drawer) is code of its own, asked for at once and loaded
    // while the signed-in user is fetched, so the first bundle holds only the router and bootstrap.
    canMatch: [startLoading(loadShell)],
    loadComponent: loadShell,
    canActivate: [signedInGuard],
    children: [
      { path: '', pathMatch: 'full', canActivate: [startPage], children: [] },
      {
        path: 'overview',
        loadChildren: () => import('./overview/overview.routes').then((m) => m.overviewRoutes),
      },
      {
        path: 'district',
        canActivate: [capabilityGuard],
        data: { capability: 'district:settings' },
        loadComponent: () =>
          import('./district/district-settings/district-settings').then((m) => m.DistrictSettings),
        title: 'District settings · Tuttiboard',
      },
      {
        path: 'schools',
        canActivate: [capabilityGuard],
        data: { capability: 'schools:read' },
        loadChildren: () => import('./schools/schools.routes').then((m) => m.schoolsRoutes),
      },
      {
        path: 'ensembles',
        canActivate: [capabilityGuard],
        data: { capability: 'roster:read' },
        loadChildren: () => import('./ensembles/ensembles.routes').then((m) => m.ensemblesRoutes),
      },
      {
        matcher: studentPageMatcher,
        canActivate: [studentPageGuard],
        loadComponent: () =>
          import('./students/student-progress/student-progress').then((m) => m.StudentProgress),
        title: 'Progress · Tuttiboard',
      },
      {
        path: 'ladder',
        canActivate: [capabilityGuard],
        data: { capability: 'ladder:read' },
        loadChildren: () => import('./ladder/ladder.routes').then((m) => m.ladderRoutes),
      },
      {
        path: 'pass-offs',
        canActivate: [capabilityGuard],
        data: { capability: 'pass-offs:write' },
        // Asked for while the route is matched, so its code arrives while the shell's guard is
        // still waiting for the signed-in user, instead of after it (the module loads once).
        // Its reads start then too (the server still checks each), so they overlap the code's load.
        canMatch: [startLoading(loadPassOffEntry), startEntryReads],
        loadComponent: loadPassOffEntry,
        title: 'Pass-offs · Tuttiboard',
      },
      {
        path: 'students',
        canActivate: [capabilityGuard],
        data: { capability: 'roster:read' },
        loadChildren: () => import('./students/students.routes').then((m) => m.studentsRoutes),
      },
      {
        path: 'practice',
        canActivate: [capabilityGuard],
        data: { capability: 'practice:read' },
        loadComponent: () =>
          import('./practice/practice-sheets/practice-sheets').then((m) => m.PracticeSheets),
        title: 'Practice sheets · Tuttiboard',
      },
      {
        path: 'imports',
        canActivate: [capabilityGuard],
        data: { capability: 'imports:run' },
        loadChildren: () => import('./imports/imports.routes').then((m) => m.importsRoutes),
      },
      {
        path: 'instruments',
        canActivate: [capabilityGuard],
        data: { capability: 'fleet:read' },
        loadChildren: () =>
          import('./instruments/instruments.routes').then((m) => m.instrumentsRoutes),
      },
      {
        path: 'loans',
        loadChildren: () => import('./loans/loans.routes').then((m) => m.loansRoutes),
      },
      {
        path: 'fees',
        canActivate: [capabilityGuard],
        data: { capability: 'loans:read' },
        loadChildren: () => import('./fees/fees.routes').then((m) => m.feesRoutes),
      },
      {
        path: 'repairs',
        canActivate: [capabilityGuard],
        data: { capability: 'fleet:read' },
        loadChildren: () => import('./repairs/repairs.routes').then((m) => m.repairsRoutes),
      },
      {
        path: 'counts',
        canActivate: [capabilityGuard],
        data: { capability: 'counts:run' },
        loadChildren: () => import('./counts/counts.routes').then((m) => m.countsRoutes),
      },
      {
        path: 'planning',
        canActivate: [capabilityGuard],
        data: { capability: 'fleet:read' },
        loadChildren: () => import('./planning/planning.routes').then((m) => m.planningRoutes),
      },
      {
        path: 'reports',
        canActivate: [capabilityGuard],
        data: { capability: 'reports:read' },
        loadChildren: () => import('./reports/reports.routes').then((m) => m.reportsRoutes),
      },
      {
        path: 'people',
        canActivate: [capabilityGuard],
        data: { capability: 'people:manage' },
        loadChildren: () => import('./people/people.routes').then((m) => m.peopleRoutes),
      },
      {
        path: 'school-years',
        canActivate: [capabilityGuard],
        data: { capability: 'years:write' },
        loadChildren: () =>
          import('./school-years/school-years.routes').then((m) => m.schoolYearsRoutes),
      },
      {
        path: 'account/tokens',
        canActivate: [capabilityGuard],
        data: { capability: 'tokens:own' },
        loadComponent: () =>
          import('./people/account-tokens/account-tokens').then((m) => m.AccountTokens),
        title: 'API tokens · Tuttiboard',
      },
      {
        path: '**',
        loadComponent: () => import('./core/not-found').then((m) => m.NotFound),
        title: 'Not found · Tuttiboard',
      },
    ],
  },
];
