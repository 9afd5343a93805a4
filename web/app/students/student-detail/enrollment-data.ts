import { Injectable } from '@angular/core';
import { ApiData } from '../../core/state/api-data';
import type { Observable } from 'rxjs';
import {
  enrollmentSchema,
  type Enrollment,
  type EnrollmentInput,
  type EnrollmentPatch,
} from '@shared/api/enrollment';

/** Seats students in ensembles through `/api/enrollments`. */
@Injectable({ providedIn: 'root' })
export class EnrollmentData extends ApiData {
  create(input: EnrollmentInput): Observable<Enrollment> {
    return this.write('POST', '/api/enrollments', input, enrollmentSchema);
  }

  update(id: number, patch: EnrollmentPatch): Observable<Enrollment> {
    return this.write('PATCH', `/api/enrollments/${id}`, patch, enrollmentSchema);
  }
}
