import { HttpClient, HttpParams, httpResource, type HttpResourceRef } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import type { ListResponse } from '@shared/api/list';
import {
  schoolListSchema,
  schoolSchema,
  type School,
  type SchoolInput,
  type SchoolPatch,
} from '@shared/api/school';
import { parsedWith } from '../core/parse';

/** Reads and writes schools through the API. */
@Injectable({ providedIn: 'root' })
export class SchoolData {
  private readonly http = inject(HttpClient);

  list(query: Record<string, string | number> = {}): Observable<ListResponse<School>> {
    return this.http
      .get('/api/schools', { params: new HttpParams({ fromObject: query }) })
      .pipe(parsedWith(schoolListSchema));
  }

  /** The school of `id()`, read again whenever it changes; idle while `id()` is undefined. */
  record(id: () => number | undefined): HttpResourceRef<School | undefined> {
    return httpResource(() => (id() === undefined ? undefined : `/api/schools/${id()}`), {
      parse: (body) => schoolSchema.parse(body),
    });
  }

  create(input: SchoolInput): Observable<School> {
    return this.http.post('/api/schools', input).pipe(parsedWith(schoolSchema));
  }

  update(id: number, patch: SchoolPatch): Observable<School> {
    return this.http.patch(`/api/schools/${id}`, patch).pipe(parsedWith(schoolSchema));
  }
}
