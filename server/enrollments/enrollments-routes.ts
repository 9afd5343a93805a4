import type { Router } from 'express';
import { enrollmentInputSchema, enrollmentPatchSchema } from '@shared/api/enrollment';
import { recordRoutes } from '../core/routes';
import type { Services } from '../services';
import { listEnrollments } from './enrollments-queries';
import {
  createEnrollment,
  deleteEnrollment,
  getEnrollment,
  updateEnrollment,
} from './enrollments-service';

/** `/api/enrollments`: seats of students in ensembles, within the actor's schools. */
export function enrollmentsRoutes({ db }: Services): Router {
  return recordRoutes(
    db,
    {
      path: '/enrollments',
      capabilities: ['roster:read', 'roster:write'],
      input: [enrollmentInputSchema, 'The enrollment'],
      patch: enrollmentPatchSchema,
    },
    {
      list: listEnrollments,
      get: getEnrollment,
      create: createEnrollment,
      update: updateEnrollment,
      remove: deleteEnrollment,
    },
  );
}
