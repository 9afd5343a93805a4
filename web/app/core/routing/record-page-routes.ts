import type { Route, Routes } from '@angular/router';
import type { Capability } from '@shared/api/capabilities';
import { capabilityGuard } from '../auth/signed-in-guard';

/** A lazily loaded page component, as `Route.loadComponent` takes it (angular.dev, "Lazy loading"). */
type PageLoader = NonNullable<Route['loadComponent']>;

/**
 * The pages of a feature with a list and a record, each a tuple as the server's `recordRoutes`
 * takes them: the list and "Add a …" page with their titles, and one record.
 */
export interface RecordPages {
  /** The list at the feature's own address: its title and component. */
  list: [title: string, load: PageLoader];
  /** The record's page, for both a new record (`id` 'new') and an existing one. */
  detail: PageLoader;
  /** `new`: the create page's title and the capability that may open it. */
  create: [title: string, capability: Capability];
  /** The existing record's address below the feature's (`:id`, `:id/edit`) and its title. */
  record: [path: string, title: string];
}

/** A page's title in the browser's tab and history: its own words, then the product's name. */
function pageTitle(words: string): string {
  return `${words} · Tuttiboard`;
}

/**
 * The child routes of a feature with a list and a record page: the list at '', the create page
 * at `new` behind `capabilityGuard` (its component reads the id 'new' from the route data
 * through `withComponentInputBinding`), and the record at `record.path`.
 */
export function recordPageRoutes({ list, detail, create, record }: RecordPages): Routes {
  const [listTitle, listPage] = list;
  const [createTitle, capability] = create;
  const [recordPath, recordTitle] = record;
  return [
    { path: '', loadComponent: listPage, title: pageTitle(listTitle) },
    {
      path: 'new',
      canActivate: [capabilityGuard],
      data: { capability, id: 'new' },
      loadComponent: detail,
      title: pageTitle(createTitle),
    },
    { path: recordPath, loadComponent: detail, title: pageTitle(recordTitle) },
  ];
}
