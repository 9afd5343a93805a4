import { HttpClient, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import {
  ensembleDetailSchema,
  ensembleSchema,
  type Ensemble,
  type EnsembleDetail,
  type EnsembleInput,
  type EnsemblePatch,
} from '../../../shared/api/ensemble';
import { listResponseSchema, type ListResponse } from '../../../shared/api/list';
import { parsedWith } from '../core/parse';

const ensembleListSchema = listResponseSchema(ensembleSchema);

/** Reads and writes ensembles through `/api/ensembles`. */
@Injectable({ providedIn: 'root' })
export class EnsembleData {
  private readonly http = inject(HttpClient);

  list(query: Record<string, string | number> = {}): Observable<ListResponse<Ensemble>> {
    return this.http
      .get('/api/ensembles', { params: new HttpParams({ fromObject: query }) })
      .pipe(parsedWith(ensembleListSchema));
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
