import { Injectable } from '@angular/core';
import { ApiData } from '../core/state/api-data';
import type { Observable } from 'rxjs';
import { listResponseSchema, type ListResponse } from '@shared/api/list';
import { createdTokenSchema, type CreatedToken } from '@shared/api/person';
import { apiTokenSchema, type ApiToken, type ApiTokenInput } from '@shared/api/token';

const tokenListSchema = listResponseSchema(apiTokenSchema);

/** API tokens: the signed-in user's own, or (the coordinator) everyone's. */
@Injectable({ providedIn: 'root' })
export class ApiTokenData extends ApiData {
  list(query: Record<string, string | number> = {}): Observable<ListResponse<ApiToken>> {
    return this.read('/api/tokens', tokenListSchema, query);
  }

  /** Makes a token for the signed-in user; the answer is the only time it is shown. */
  create(input: ApiTokenInput): Observable<CreatedToken> {
    return this.write('POST', '/api/tokens', input, createdTokenSchema);
  }

  revoke(id: number): Observable<unknown> {
    return this.http.delete(`/api/tokens/${id}`);
  }
}
