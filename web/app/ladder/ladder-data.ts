import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { map, type Observable } from 'rxjs';
import { z } from 'zod';
import {
  ladderSchema,
  ladderVersionSummarySchema,
  type Ladder,
  type LadderPatch,
  type LadderVersionSummary,
} from '../../../shared/api/ladder';
import { parsedWith } from '../core/parse';

const versionListSchema = z.object({
  rows: z.array(ladderVersionSummarySchema),
  total: z.number(),
});

/** Reads the scale ladder and, for the coordinator, drafts and publishes its versions. */
@Injectable({ providedIn: 'root' })
export class LadderData {
  private readonly http = inject(HttpClient);

  /** The version in force, with its rungs, requirements and benchmarks. */
  active(): Observable<Ladder> {
    return this.http.get('/api/ladder').pipe(parsedWith(ladderSchema));
  }

  /** Every version, newest first (drafts only for the coordinator). */
  versions(): Observable<LadderVersionSummary[]> {
    return this.http.get('/api/ladder/versions').pipe(
      parsedWith(versionListSchema),
      map((list) => list.rows),
    );
  }

  version(id: number): Observable<Ladder> {
    return this.http.get(`/api/ladder/versions/${id}`).pipe(parsedWith(ladderSchema));
  }

  /** A new draft copied from the version in force, or from the starter ladder. */
  createDraft(name?: string, starter = false): Observable<Ladder> {
    return this.http
      .post('/api/ladder/versions', { ...(name ? { name } : {}), ...(starter ? { starter } : {}) })
      .pipe(parsedWith(ladderSchema));
  }

  updateDraft(id: number, patch: LadderPatch): Observable<Ladder> {
    return this.http.patch(`/api/ladder/versions/${id}`, patch).pipe(parsedWith(ladderSchema));
  }

  deleteDraft(id: number): Observable<unknown> {
    return this.http.delete(`/api/ladder/versions/${id}`);
  }

  /** Puts a draft in force; the server recomputes every student's rung against it. */
  publish(id: number): Observable<Ladder> {
    return this.http.post(`/api/ladder/versions/${id}/publish`, {}).pipe(parsedWith(ladderSchema));
  }
}
