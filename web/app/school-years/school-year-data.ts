import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
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
import { parsedWith } from '../core/parse';

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
export class SchoolYearData {
  private readonly http = inject(HttpClient);

  list(): Observable<SchoolYearList> {
    return this.http.get('/api/school-years').pipe(parsedWith(schoolYearListSchema));
  }

  create(input: SchoolYearInput): Observable<SchoolYear> {
    return this.http.post('/api/school-years', input).pipe(parsedWith(schoolYearSchema));
  }

  update(id: number, patch: SchoolYearPatch): Observable<SchoolYear> {
    return this.http.patch(`/api/school-years/${id}`, patch).pipe(parsedWith(schoolYearSchema));
  }

  preview(request: YearStartRequest): Observable<YearStartResult> {
    return this.http
      .post('/api/school-years/start/preview', request)
      .pipe(parsedWith(yearStartResultSchema));
  }

  start(request: YearStartRequest): Observable<YearStartResult> {
    return this.http
      .post('/api/school-years/start', request)
      .pipe(parsedWith(yearStartResultSchema));
  }
}
