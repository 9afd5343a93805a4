import type { HttpResourceRef } from '@angular/common/http';
import { Injectable } from '@angular/core';
import { ApiData } from '../core/state/api-data';
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
export class EnsembleData extends ApiData {
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

  /** The ensemble of `id()`, with its members; idle while `id()` is undefined. */
  record(id: () => number | undefined): HttpResourceRef<EnsembleDetail | undefined> {
    return this.resource(
      () => (id() === undefined ? undefined : `/api/ensembles/${id()}`),
      ensembleDetailSchema,
    );
  }

  get(id: number): Observable<EnsembleDetail> {
    return this.read(`/api/ensembles/${id}`, ensembleDetailSchema);
  }

  create(input: EnsembleInput): Observable<Ensemble> {
    return this.write('POST', '/api/ensembles', input, ensembleSchema);
  }

  update(id: number, patch: EnsemblePatch): Observable<Ensemble> {
    return this.write('PATCH', `/api/ensembles/${id}`, patch, ensembleSchema);
  }
}
