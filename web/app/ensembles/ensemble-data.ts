import { HttpClient, httpResource, type HttpResourceRef } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
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
import { parsedWith } from '../core/parse';

export const ensembleListSchema = listResponseSchema(ensembleSchema);

/** Reads and writes ensembles through `/api/ensembles`. */
@Injectable({ providedIn: 'root' })
export class EnsembleData {
  private readonly http = inject(HttpClient);

  /** The ensembles `query()` selects, read again whenever it changes. */
  listed(
    query: () => Record<string, string | number>,
  ): HttpResourceRef<ListResponse<Ensemble> | undefined> {
    return httpResource(() => ({ url: '/api/ensembles', params: query() }), {
      parse: (body) => ensembleListSchema.parse(body),
    });
  }

  /** The ensembles of the school `schoolId()`, by name; idle while it is undefined. */
  ofSchool(
    schoolId: () => number | undefined,
  ): HttpResourceRef<ListResponse<Ensemble> | undefined> {
    return httpResource(
      () => {
        const id = schoolId();
        return id === undefined
          ? undefined
          : { url: '/api/ensembles', params: { schoolId: id, sort: 'name:asc', limit: 200 } };
      },
      { parse: (body) => ensembleListSchema.parse(body) },
    );
  }

  /** The ensemble of `id()`, with its members; idle while `id()` is undefined. */
  record(id: () => number | undefined): HttpResourceRef<EnsembleDetail | undefined> {
    return httpResource(() => (id() === undefined ? undefined : `/api/ensembles/${id()}`), {
      parse: (body) => ensembleDetailSchema.parse(body),
    });
  }

  get(id: number): Observable<EnsembleDetail> {
    return this.http.get(`/api/ensembles/${id}`).pipe(parsedWith(ensembleDetailSchema));
  }

  create(input: EnsembleInput): Observable<Ensemble> {
    return this.http.post('/api/ensembles', input).pipe(parsedWith(ensembleSchema));
  }

  update(id: number, patch: EnsemblePatch): Observable<Ensemble> {
    return this.http.patch(`/api/ensembles/${id}`, patch).pipe(parsedWith(ensembleSchema));
  }
}
