import type { Router } from 'express';
import { schoolInputSchema, schoolPatchSchema } from '@shared/api/school';
import { recordRoutes } from '../core/routes';
import type { Services } from '../services';
import {
  createSchool,
  deleteSchool,
  getSchool,
  listSchools,
  updateSchool,
} from './schools-service';

/** `/api/schools`: everyone with a school view reads; the coordinator changes. */
export function schoolsRoutes({ db }: Services): Router {
  return recordRoutes(
    db,
    {
      path: '/schools',
      capabilities: ['schools:read', 'schools:write'],
      input: [schoolInputSchema, 'The school'],
      patch: schoolPatchSchema,
    },
    {
      list: listSchools,
      get: getSchool,
      create: createSchool,
      update: updateSchool,
      remove: deleteSchool,
    },
  );
}
