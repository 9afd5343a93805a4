import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import {
  enrollmentSchema,
  type Enrollment,
  type EnrollmentInput,
  type EnrollmentPatch,
} from '@shared/api/enrollment';
import { parsedWith } from '../../core/parse';

/** Seats students in ensembles through `/api/enrollments`. */
@Injectable({ providedIn: 'root' })
export class EnrollmentData {
  private readonly http = inject(HttpClient);

  create(input: EnrollmentInput): Observable<Enrollment> {
    return this.http.post('/api/enrollments', input).pipe(parsedWith(enrollmentSchema));
  }

  update(id: number, patch: EnrollmentPatch): Observable<Enrollment> {
    return this.http.patch(`/api/enrollments/${id}`, patch).pipe(parsedWith(enrollmentSchema));
  }
}
