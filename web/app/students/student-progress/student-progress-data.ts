import { httpResource, type HttpResourceRef } from '@angular/common/http';
import { Injectable } from '@angular/core';
import { studentProgressSchema, type StudentProgress } from '@shared/api/analytics';

/** Reads where a student stands on the ladder in force. */
@Injectable({ providedIn: 'root' })
export class StudentProgressData {
  /**
   * The rung, next requirements, pass-offs and recordings of student `studentId()` (404 outside
   * the caller's reach), read again when the id changes; idle while it is undefined.
   */
  progress(studentId: () => number | undefined): HttpResourceRef<StudentProgress | undefined> {
    return httpResource(
      () =>
        studentId() === undefined ? undefined : `/api/analytics/students/${studentId()}/progress`,
      { parse: (body) => studentProgressSchema.parse(body) },
    );
  }
}
