import { HttpClient, httpResource, type HttpResourceRef } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import {
  countDetailSchema,
  countScanSchema,
  countSchema,
  type Count,
  type CountDetail,
  type CountScan,
} from '@shared/api/count';
import { listResponseSchema, type ListResponse } from '@shared/api/list';
import { parsedWith } from '../core/parse';

const countListSchema = listResponseSchema(countSchema);

/** Inventory counts through `/api/counts`: start, scan, reconcile, close. */
@Injectable({ providedIn: 'root' })
export class InventoryCounts {
  private readonly http = inject(HttpClient);

  /** The latest counts the caller may see, newest first. */
  recent(limit: number): HttpResourceRef<ListResponse<Count> | undefined> {
    return httpResource(() => ({ url: '/api/counts', params: { limit } }), {
      parse: (body) => countListSchema.parse(body),
    });
  }

  /** Count `id()` with its reconciliation, read again whenever the id changes. */
  detail(id: () => number): HttpResourceRef<CountDetail | undefined> {
    return httpResource(() => `/api/counts/${id()}`, {
      parse: (body) => countDetailSchema.parse(body),
    });
  }

  start(schoolId: number): Observable<CountDetail> {
    return this.http.post('/api/counts', { schoolId }).pipe(parsedWith(countDetailSchema));
  }

  scan(id: number, assetTag: string): Observable<CountScan> {
    return this.http
      .post(`/api/counts/${id}/scans`, { assetTag })
      .pipe(parsedWith(countScanSchema));
  }

  /** Closes the count; with `confirmMissing`, what was expected and not found is marked missing. */
  close(id: number, confirmMissing: boolean): Observable<CountDetail> {
    return this.http
      .post(`/api/counts/${id}/close`, { confirmMissing })
      .pipe(parsedWith(countDetailSchema));
  }
}
