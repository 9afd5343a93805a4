import { Injectable } from '@angular/core';
import { RecordWrites } from '../../core/state/record-data';
import {
  enrollmentSchema,
  type Enrollment,
  type EnrollmentInput,
  type EnrollmentPatch,
} from '@shared/api/enrollment';

/** Seats students in ensembles through `/api/enrollments`. */
@Injectable({ providedIn: 'root' })
export class EnrollmentData extends RecordWrites<Enrollment, EnrollmentInput, EnrollmentPatch> {
  constructor() {
    super('/api/enrollments', enrollmentSchema);
  }
}
