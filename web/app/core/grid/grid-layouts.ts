import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { catchError, map, of, type Observable } from 'rxjs';
import { gridPreferenceSchema, type GridState } from '@shared/api/grid-preference';
import { parsedWith } from '../parse';

/** Each user's remembered grid layouts, through `/api/grid-preferences/:grid`. */
@Injectable({ providedIn: 'root' })
export class GridLayouts {
  private readonly http = inject(HttpClient);

  /** The remembered layout, or null when there is none or it cannot be read. */
  load(gridId: string): Observable<GridState | null> {
    return this.http.get(`/api/grid-preferences/${encodeURIComponent(gridId)}`).pipe(
      parsedWith(gridPreferenceSchema),
      map((preference) => preference.state),
      // A layout that cannot be read leaves the grid in its default layout, never broken.
      catchError(() => of(null)),
    );
  }

  /** Remembers the layout for the signed-in user. */
  save(gridId: string, state: GridState): Observable<unknown> {
    return this.http.put(`/api/grid-preferences/${encodeURIComponent(gridId)}`, { state });
  }
}
