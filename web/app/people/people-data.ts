import { HttpClient, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import { listResponseSchema, type ListResponse } from '@shared/api/list';
import {
  auditEntrySchema,
  personDetailSchema,
  personSchema,
  type AuditEntryRow,
  type Person,
  type PersonDetail,
  type PersonInput,
  type PersonPatch,
} from '@shared/api/person';
import { parsedWith } from '../core/parse';

const personListSchema = listResponseSchema(personSchema);
const auditListSchema = listResponseSchema(auditEntrySchema);

/** Reads and changes who signs in, and reads the audit log, through the API. */
@Injectable({ providedIn: 'root' })
export class PeopleData {
  private readonly http = inject(HttpClient);

  list(query: Record<string, string | number> = {}): Observable<ListResponse<Person>> {
    return this.http
      .get('/api/users', { params: new HttpParams({ fromObject: query }) })
      .pipe(parsedWith(personListSchema));
  }

  get(id: number): Observable<PersonDetail> {
    return this.http.get(`/api/users/${id}`).pipe(parsedWith(personDetailSchema));
  }

  create(input: PersonInput): Observable<PersonDetail> {
    return this.http.post('/api/users', input).pipe(parsedWith(personDetailSchema));
  }

  update(id: number, patch: PersonPatch): Observable<PersonDetail> {
    return this.http.patch(`/api/users/${id}`, patch).pipe(parsedWith(personDetailSchema));
  }

  audit(query: Record<string, string | number> = {}): Observable<ListResponse<AuditEntryRow>> {
    return this.http
      .get('/api/audit', { params: new HttpParams({ fromObject: query }) })
      .pipe(parsedWith(auditListSchema));
  }
}
