import { HttpParams } from '@angular/common/http';
import { Injectable } from '@angular/core';
import { ApiData } from '../core/state/api-data';
import type { Observable } from 'rxjs';
import { listResponseSchema, type ListResponse } from '@shared/api/list';
import {
  outboxMessageDetailSchema,
  outboxMessageSchema,
  type OutboxMessage,
  type OutboxMessageDetail,
} from '@shared/api/outbox';
import { parsedWith } from '../core/parse';

/** The outbox's filters and page. */
export interface OutboxQuery {
  state: OutboxMessage['state'] | null;
  offset: number;
  limit: number;
}

/** Reads the outbox and sends a failed message again. */
@Injectable({ providedIn: 'root' })
export class OutboxData extends ApiData {
  list(query: OutboxQuery): Observable<ListResponse<OutboxMessage>> {
    const params: Record<string, string | number> = {
      sort: 'createdAt:desc',
      offset: query.offset,
      limit: query.limit,
    };
    if (query.state) params['state'] = query.state;
    return this.http
      .get('/api/outbox', { params: new HttpParams({ fromObject: params }) })
      .pipe(parsedWith(listResponseSchema(outboxMessageSchema)));
  }

  get(id: number): Observable<OutboxMessageDetail> {
    return this.read(`/api/outbox/${id}`, outboxMessageDetailSchema);
  }

  resend(id: number): Observable<OutboxMessageDetail> {
    return this.write('POST', `/api/outbox/${id}/resend`, {}, outboxMessageDetailSchema);
  }
}
