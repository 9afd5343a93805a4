import { HttpClient, httpResource, type HttpResourceRef } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { map, type Observable } from 'rxjs';
import * as z from 'zod';
import {
  ladderImpactSchema,
  ladderImpactStudentSchema,
  ladderSchema,
  ladderVersionSummarySchema,
  type Ladder,
  type LadderImpact,
  type LadderImpactStudent,
  type LadderPatch,
  type LadderVersionSummary,
} from '@shared/api/ladder';
import { parsedWith } from '../core/parse';

const versionListSchema = z.object({
  rows: z.array(ladderVersionSummarySchema),
  total: z.number(),
});

const impactStudentListSchema = z.object({
  rows: z.array(ladderImpactStudentSchema),
  total: z.number(),
});

/** Reads the scale ladder and, for the coordinator, drafts and publishes its versions. */
@Injectable({ providedIn: 'root' })
export class LadderData {
  private readonly http = inject(HttpClient);

  /** The version in force, read once per call (in an injection context); 404 when none is. */
  inForce(): HttpResourceRef<Ladder | undefined> {
    return httpResource(() => '/api/ladder', { parse: (body) => ladderSchema.parse(body) });
  }

  /** Every version, newest first, while `wanted()` (drafts only for the coordinator). */
  versionList(wanted: () => boolean = () => true): HttpResourceRef<LadderVersionSummary[]> {
    return httpResource(() => (wanted() ? '/api/ladder/versions' : undefined), {
      parse: (body) => versionListSchema.parse(body).rows,
      defaultValue: [],
    });
  }

  /** Every version, newest first (drafts only for the coordinator). */
  versions(): Observable<LadderVersionSummary[]> {
    return this.http.get('/api/ladder/versions').pipe(
      parsedWith(versionListSchema),
      map((list) => list.rows),
    );
  }

  /** Version `id()` with its rungs, read again whenever the id changes. */
  version(id: () => number): HttpResourceRef<Ladder | undefined> {
    return httpResource(() => `/api/ladder/versions/${id()}`, {
      parse: (body) => ladderSchema.parse(body),
    });
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

  /** What putting a version in force would do to every student's rung. */
  impact(id: number): Observable<LadderImpact> {
    return this.http.get(`/api/ladder/versions/${id}/impact`).pipe(parsedWith(ladderImpactSchema));
  }

  /** The students behind one figure of the impact. */
  impactStudents(
    id: number,
    filter: { schoolId: number; grade: number; move: 'up' | 'down' | 'same' },
  ): Observable<LadderImpactStudent[]> {
    return this.http
      .get(`/api/ladder/versions/${id}/impact/students`, { params: { ...filter } })
      .pipe(
        parsedWith(impactStudentListSchema),
        map((list) => list.rows),
      );
  }

  /**
   * Puts a draft in force under its published name, once its impact (the token) was seen; the
   * server recomputes every student's rung against it.
   */
  publish(id: number, name: string, impactToken: string): Observable<Ladder> {
    return this.http
      .post(`/api/ladder/versions/${id}/publish`, { name, impactToken })
      .pipe(parsedWith(ladderSchema));
  }

  /** Puts an earlier version back in force (a roll-back), once its impact was seen. */
  restore(id: number, impactToken: string): Observable<Ladder> {
    return this.http
      .post(`/api/ladder/versions/${id}/restore`, { impactToken })
      .pipe(parsedWith(ladderSchema));
  }
}
