import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { catchError, forkJoin, map, of, switchMap, type Observable } from 'rxjs';
import { gridPreferenceSchema, type GridState } from '@shared/api/grid-preference';
import { parsedWith } from '../core/parse';

/** The filters a saved view of the fleet keeps. */
export interface InstrumentViewFilters {
  q?: string;
  status?: string;
  condition?: string;
  family?: string;
  homeSchoolId?: number;
}

/** A named set of fleet filters the user saved. */
export interface InstrumentView {
  name: string;
  filters: InstrumentViewFilters;
}

const indexGrid = 'instruments-saved-views';
const filterNames = ['q', 'status', 'condition', 'family', 'homeSchoolId'] as const;

/** The grid name a view is kept under: `instruments-<name in lower case, dashes>`. */
export function viewGridName(name: string): string {
  const slug = name
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 40);
  // The index has its own name; a view may not take it.
  const safe = !slug || slug === 'saved-views' ? `view-${slug}` : slug;
  return `instruments-${safe}`.replace(/-+$/, '');
}

/**
 * A view's filters as a grid state: each filter is kept as one `name=value` entry of the state's
 * column list, the shape `/api/grid-preferences` accepts.
 */
export function viewState(filters: InstrumentViewFilters): GridState {
  const columns = filterNames.flatMap((name) => {
    const value = filters[name];
    return value === undefined || value === '' ? [] : [{ colId: `${name}=${value}`.slice(0, 100) }];
  });
  return { columns };
}

/** The filters kept in a grid state by `viewState`; unknown entries are ignored. */
export function viewFilters(state: GridState | null): InstrumentViewFilters {
  const filters: InstrumentViewFilters = {};
  for (const { colId } of state?.columns ?? []) {
    const split = colId.indexOf('=');
    if (split < 1) continue;
    const name = colId.slice(0, split);
    const value = colId.slice(split + 1);
    if (name === 'homeSchoolId') {
      const id = Number(value);
      if (Number.isInteger(id) && id > 0) filters.homeSchoolId = id;
    } else if ((filterNames as readonly string[]).includes(name)) {
      filters[name as Exclude<(typeof filterNames)[number], 'homeSchoolId'>] = value;
    }
  }
  return filters;
}

/**
 * The signed-in user's saved views of the fleet, kept with `/api/grid-preferences`: an index
 * (`instruments-saved-views`, one entry per view name) and one entry per view.
 */
@Injectable({ providedIn: 'root' })
export class InstrumentViews {
  private readonly http = inject(HttpClient);

  /** Every saved view, in the order saved; an unreadable one is left out. */
  list(): Observable<InstrumentView[]> {
    return this.names().pipe(
      switchMap((names) =>
        names.length === 0
          ? of([])
          : forkJoin(
              names.map((name) =>
                this.read(viewGridName(name)).pipe(
                  map((state) => ({ name, filters: viewFilters(state) })),
                ),
              ),
            ),
      ),
    );
  }

  /** Saves (or replaces) a view under its name. */
  save(view: InstrumentView): Observable<InstrumentView[]> {
    return this.http
      .put(`/api/grid-preferences/${viewGridName(view.name)}`, {
        state: viewState(view.filters),
      })
      .pipe(
        switchMap(() => this.names()),
        switchMap((names) => {
          const kept = names.filter((name) => viewGridName(name) !== viewGridName(view.name));
          return this.writeNames([...kept, view.name]);
        }),
        switchMap(() => this.list()),
      );
  }

  /** Forgets a view. */
  remove(name: string): Observable<InstrumentView[]> {
    return this.http.delete(`/api/grid-preferences/${viewGridName(name)}`).pipe(
      switchMap(() => this.names()),
      switchMap((names) => this.writeNames(names.filter((kept) => kept !== name))),
      switchMap(() => this.list()),
    );
  }

  private names(): Observable<string[]> {
    return this.read(indexGrid).pipe(
      map((state) => (state?.columns ?? []).map((column) => column.colId)),
    );
  }

  private writeNames(names: string[]): Observable<unknown> {
    return this.http.put(`/api/grid-preferences/${indexGrid}`, {
      state: { columns: names.map((name) => ({ colId: name })) },
    });
  }

  private read(grid: string): Observable<GridState | null> {
    return this.http.get(`/api/grid-preferences/${grid}`).pipe(
      parsedWith(gridPreferenceSchema),
      map((preference) => preference.state),
      catchError(() => of(null)),
    );
  }
}
