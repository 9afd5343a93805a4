import { Injectable } from '@angular/core';
import { ApiData } from '../core/state/api-data';
import type { Observable } from 'rxjs';
import {
  schoolYearListSchema,
  schoolYearSchema,
  yearStartResultSchema,
  type SchoolYear,
  type SchoolYearInput,
  type SchoolYearList,
  type SchoolYearPatch,
  type YearStartResult,
} from '@shared/api/school-year';

/** What the start form sends (the shared input before its defaults are applied). */
export interface YearStartRequest {
  name: string;
  startsOn: string;
  endsOn: string;
  emptyEnsembles: boolean;
  basis?: number;
}

/** Reads, adds and edits school years, and previews and starts a new one, through the API. */
@Injectable({ providedIn: 'root' })
export class SchoolYearData extends ApiData {
  list(): Observable<SchoolYearList> {
    return this.read('/api/school-years', schoolYearListSchema);
  }

  create(input: SchoolYearInput): Observable<SchoolYear> {
    return this.write('POST', '/api/school-years', input, schoolYearSchema);
  }

  update(id: number, patch: SchoolYearPatch): Observable<SchoolYear> {
    return this.write('PATCH', `/api/school-years/${id}`, patch, schoolYearSchema);
  }

  preview(request: YearStartRequest): Observable<YearStartResult> {
    return this.write('POST', '/api/school-years/start/preview', request, yearStartResultSchema);
  }

  start(request: YearStartRequest): Observable<YearStartResult> {
    return this.write('POST', '/api/school-years/start', request, yearStartResultSchema);
  }
}
