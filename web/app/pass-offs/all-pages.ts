import { forkJoin, map, of, switchMap, type Observable } from 'rxjs';
import type { ListResponse } from '@shared/api/list';

/**
 * Every row of a paged list: the first page tells the total, and the pages after it are asked
 * for together (one round trip more in all, not one per page), then joined in page order.
 */
export function allPages<Row>(
  page: (offset: number) => Observable<ListResponse<Row>>,
  pageSize: number,
): Observable<Row[]> {
  return page(0).pipe(
    switchMap((first) => {
      const offsets: number[] = [];
      for (let offset = pageSize; offset < first.total; offset += pageSize) offsets.push(offset);
      if (offsets.length === 0) return of(first.rows);
      return forkJoin(offsets.map(page)).pipe(
        map((rest) => first.rows.concat(...rest.map((list) => list.rows))),
      );
    }),
  );
}
