import type { HttpResourceRef } from '@angular/common/http';
import { Injectable } from '@angular/core';
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
import { ApiData } from '../core/state/api-data';

const countListSchema = listResponseSchema(countSchema);

/** Inventory counts through `/api/counts`: start, scan, reconcile, close. */
@Injectable({ providedIn: 'root' })
export class InventoryCounts extends ApiData {
  /** The latest counts the caller may see, newest first. */
  recent(limit: number): HttpResourceRef<ListResponse<Count> | undefined> {
    return this.resource(() => ({ url: '/api/counts', params: { limit } }), countListSchema);
  }

  /** Count `id()` with its reconciliation, read again whenever the id changes. */
  detail(id: () => number): HttpResourceRef<CountDetail | undefined> {
    return this.resource(() => `/api/counts/${id()}`, countDetailSchema);
  }

  start(schoolId: number): Observable<CountDetail> {
    return this.write('POST', '/api/counts', { schoolId }, countDetailSchema);
  }

  scan(id: number, assetTag: string): Observable<CountScan> {
    return this.write('POST', `/api/counts/${id}/scans`, { assetTag }, countScanSchema);
  }

  /** Closes the count; with `confirmMissing`, what was expected and not found is marked missing. */
  close(id: number, confirmMissing: boolean): Observable<CountDetail> {
    return this.write('POST', `/api/counts/${id}/close`, { confirmMissing }, countDetailSchema);
  }
}
