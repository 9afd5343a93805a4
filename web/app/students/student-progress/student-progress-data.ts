import { HttpClient, httpResource, type HttpResourceRef } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import { studentProgressSchema, type StudentProgress } from '@shared/api/analytics';
import { parsedWith } from '../../core/parse';

/** Reads where a student stands on the ladder in force. */
@Injectable({ providedIn: 'root' })
export class StudentProgressData {
  private readonly http = inject(HttpClient);

  /** The student's rung, next requirements, pass-offs and recordings; 404 outside the caller's reach. */
  get(studentId: number): Observable<StudentProgress> {
    return this.http
      .get(`/api/analytics/students/${studentId}/progress`)
      .pipe(parsedWith(studentProgressSchema));
  }

  /** The progress of student `studentId()`, read again when it changes; idle while undefined. */
  progress(studentId: () => number | undefined): HttpResourceRef<StudentProgress | undefined> {
    return httpResource(
      () =>
        studentId() === undefined ? undefined : `/api/analytics/students/${studentId()}/progress`,
      { parse: (body) => studentProgressSchema.parse(body) },
    );
  }
}
