import type { HttpResourceRef } from '@angular/common/http';
import { Injectable } from '@angular/core';
import type { Observable } from 'rxjs';
import type { ListResponse } from '@shared/api/list';
import {
  schoolListSchema,
  schoolSchema,
  type School,
  type SchoolInput,
  type SchoolPatch,
} from '@shared/api/school';
import { ApiData, type ListQuery } from '../core/state/api-data';

/** Reads and writes schools through the API. */
@Injectable({ providedIn: 'root' })
export class SchoolData extends ApiData {
  list(query: ListQuery = {}): Observable<ListResponse<School>> {
    return this.read('/api/schools', schoolListSchema, query);
  }

  /** The school of `id()`, read again whenever it changes; idle while `id()` is undefined. */
  record(id: () => number | undefined): HttpResourceRef<School | undefined> {
    return this.resource(
      () => (id() === undefined ? undefined : `/api/schools/${id()}`),
      schoolSchema,
    );
  }

  create(input: SchoolInput): Observable<School> {
    return this.write('POST', '/api/schools', input, schoolSchema);
  }

  update(id: number, patch: SchoolPatch): Observable<School> {
    return this.write('PATCH', `/api/schools/${id}`, patch, schoolSchema);
  }
}
