import type { HttpResourceRef } from '@angular/common/http';
import { Injectable } from '@angular/core';
import { RecordData } from '../core/state/record-data';
import type { Observable } from 'rxjs';
import {
  ensembleDetailSchema,
  ensembleSchema,
  type Ensemble,
  type EnsembleDetail,
  type EnsembleInput,
  type EnsemblePatch,
} from '@shared/api/ensemble';
import { listResponseSchema, type ListResponse } from '@shared/api/list';

export const ensembleListSchema = listResponseSchema(ensembleSchema);

/** Reads and writes ensembles through `/api/ensembles`. */
@Injectable({ providedIn: 'root' })
export class EnsembleData extends RecordData<
  Ensemble,
  EnsembleInput,
  EnsemblePatch,
  EnsembleDetail
> {
  constructor() {
    super('/api/ensembles', ensembleSchema, ensembleDetailSchema);
  }

  /** The ensembles `query()` selects, read again whenever it changes. */
  listed(
    query: () => Record<string, string | number>,
  ): HttpResourceRef<ListResponse<Ensemble> | undefined> {
    return this.resource(() => ({ url: '/api/ensembles', params: query() }), ensembleListSchema);
  }

  /** The ensembles of the school `schoolId()`, by name; idle while it is undefined. */
  ofSchool(
    schoolId: () => number | undefined,
  ): HttpResourceRef<ListResponse<Ensemble> | undefined> {
    return this.resource(() => {
      const id = schoolId();
      return id === undefined
        ? undefined
        : { url: '/api/ensembles', params: { schoolId: id, sort: 'name:asc', limit: 200 } };
    }, ensembleListSchema);
  }

  get(id: number): Observable<EnsembleDetail> {
    return this.read(`/api/ensembles/${id}`, ensembleDetailSchema);
  }
}
