import { Injectable } from '@angular/core';
import { ApiData } from '../core/state/api-data';
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

const personListSchema = listResponseSchema(personSchema);
const auditListSchema = listResponseSchema(auditEntrySchema);

/** Reads and changes who signs in, and reads the audit log, through the API. */
@Injectable({ providedIn: 'root' })
export class PeopleData extends ApiData {
  list(query: Record<string, string | number> = {}): Observable<ListResponse<Person>> {
    return this.read('/api/users', personListSchema, query);
  }

  get(id: number): Observable<PersonDetail> {
    return this.read(`/api/users/${id}`, personDetailSchema);
  }

  create(input: PersonInput): Observable<PersonDetail> {
    return this.write('POST', '/api/users', input, personDetailSchema);
  }

  update(id: number, patch: PersonPatch): Observable<PersonDetail> {
    return this.write('PATCH', `/api/users/${id}`, patch, personDetailSchema);
  }

  audit(query: Record<string, string | number> = {}): Observable<ListResponse<AuditEntryRow>> {
    return this.read('/api/audit', auditListSchema, query);
  }
}
