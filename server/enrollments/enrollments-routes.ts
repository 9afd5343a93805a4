import { enrollmentInputSchema, enrollmentPatchSchema } from '@shared/api/enrollment';
import { recordRoutes } from '../core/routes';
import { listEnrollments } from './enrollments-queries';
import {
  createEnrollment,
  deleteEnrollment,
  getEnrollment,
  updateEnrollment,
} from './enrollments-service';

/** `/api/enrollments`: seats of students in ensembles, within the actor's schools. */
export const enrollmentsRoutes = recordRoutes('/enrollments', {
  read: ['roster:read', listEnrollments, getEnrollment],
  create: ['roster:write', enrollmentInputSchema, 'The enrollment', createEnrollment],
  update: ['roster:write', enrollmentPatchSchema, updateEnrollment],
  remove: ['roster:write', deleteEnrollment],
});
