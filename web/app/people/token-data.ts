import { HttpClient, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import { listResponseSchema, type ListResponse } from '@shared/api/list';
import { createdTokenSchema, type CreatedToken } from '@shared/api/person';
import { apiTokenSchema, type ApiToken, type ApiTokenInput } from '@shared/api/token';
import { parsedWith } from '../core/parse';

const tokenListSchema = listResponseSchema(apiTokenSchema);

/** API tokens: the signed-in user's own, or (the coordinator) everyone's. */
@Injectable({ providedIn: 'root' })
export class ApiTokenData {
  private readonly http = inject(HttpClient);

  list(query: Record<string, string | number> = {}): Observable<ListResponse<ApiToken>> {
    return this.http
      .get('/api/tokens', { params: new HttpParams({ fromObject: query }) })
      .pipe(parsedWith(tokenListSchema));
  }

  /** Makes a token for the signed-in user; the answer is the only time it is shown. */
  create(input: ApiTokenInput): Observable<CreatedToken> {
    return this.http.post('/api/tokens', input).pipe(parsedWith(createdTokenSchema));
  }

  revoke(id: number): Observable<unknown> {
    return this.http.delete(`/api/tokens/${id}`);
  }
}
