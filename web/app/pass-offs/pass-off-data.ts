import { HttpClient, HttpParams, httpResource, type HttpResourceRef } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { map, type Observable } from 'rxjs';
import { attainmentRowSchema, type AttainmentRow } from '@shared/api/analytics';
import { listResponseSchema, type ListResponse } from '@shared/api/list';
import {
  passOffBatchResultSchema,
  passOffSchema,
  recordingSchema,
  type PassOff,
  type PassOffBatchResult,
  type PassOffInput,
  type PassOffPatch,
  type Recording,
} from '@shared/api/pass-off';
import { parsedWith } from '../core/parse';
import { allPages } from './all-pages';
import { passOffPageSize, rungRowsLimit } from '@shared/api/entry-reads';

export const passOffListSchema = listResponseSchema(passOffSchema);
export const attainmentListSchema = listResponseSchema(attainmentRowSchema);

/** Reads and records pass-offs, and their recordings, through `/api/pass-offs`. */
@Injectable({ providedIn: 'root' })
export class PassOffData {
  private readonly http = inject(HttpClient);

  list(query: Record<string, string | number | boolean>): Observable<ListResponse<PassOff>> {
    return this.http
      .get('/api/pass-offs', { params: new HttpParams({ fromObject: query }) })
      .pipe(parsedWith(passOffListSchema));
  }

  /** The pass-offs of student `studentId()`, newest first; read again when it changes. */
  ofStudent(studentId: () => number): HttpResourceRef<ListResponse<PassOff> | undefined> {
    return httpResource(
      () => ({
        url: '/api/pass-offs',
        params: { studentId: studentId(), sort: 'heardOn:desc', limit: 1000 },
      }),
      { parse: (body) => passOffListSchema.parse(body) },
    );
  }

  /** Every pass-off the query selects, its pages after the first asked for together. */
  all(query: Record<string, string | number | boolean>): Observable<PassOff[]> {
    return allPages(
      (offset) => this.list({ ...query, limit: passOffPageSize, offset }),
      passOffPageSize,
    );
  }

  /** Each active student of the ensemble with their rung on the ladder in force. */
  rungsOfEnsemble(ensembleId: number): Observable<AttainmentRow[]> {
    return this.http
      .get('/api/analytics/students', {
        params: { ensembleId, limit: rungRowsLimit },
      })
      .pipe(
        parsedWith(attainmentListSchema),
        map((list) => list.rows),
      );
  }

  /** Records a batch; pass-offs whose client key the server has seen come back as they stand. */
  record(passOffs: PassOffInput[]): Observable<PassOffBatchResult> {
    return this.http
      .post('/api/pass-offs', { passOffs })
      .pipe(parsedWith(passOffBatchResultSchema));
  }

  update(id: number, patch: PassOffPatch): Observable<PassOff> {
    return this.http.patch(`/api/pass-offs/${id}`, patch).pipe(parsedWith(passOffSchema));
  }

  remove(id: number): Observable<unknown> {
    return this.http.delete(`/api/pass-offs/${id}`);
  }

  /** Attaches (or replaces) the pass-off's recording; the server checks the file's own bytes. */
  attachRecording(id: number, file: File): Observable<Recording> {
    const form = new FormData();
    form.append('recording', file, file.name);
    return this.http.post(`/api/pass-offs/${id}/recording`, form).pipe(parsedWith(recordingSchema));
  }
}

/** Where a pass-off's recording plays from. */
export function recordingUrl(passOffId: number): string {
  return `/api/pass-offs/${passOffId}/recording`;
}
