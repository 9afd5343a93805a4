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
import type { ListQuery } from '../core/state/api-data';
import { RecordData } from '../core/state/record-data';

/** Reads and writes schools through the API. */
@Injectable({ providedIn: 'root' })
export class SchoolData extends RecordData<School, SchoolInput, SchoolPatch> {
  constructor() {
    super('/api/schools', schoolSchema, schoolSchema);
  }

  list(query: ListQuery = {}): Observable<ListResponse<School>> {
    return this.read('/api/schools', schoolListSchema, query);
  }
}
