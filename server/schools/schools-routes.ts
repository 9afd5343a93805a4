import { schoolInputSchema, schoolPatchSchema } from '@shared/api/school';
import { recordRoutes } from '../core/routes';
import {
  createSchool,
  deleteSchool,
  getSchool,
  listSchools,
  updateSchool,
} from './schools-service';

/** `/api/schools`: everyone with a school view reads; the coordinator changes. */
export const schoolsRoutes = recordRoutes('/schools', {
  read: ['schools:read', listSchools, getSchool],
  create: ['schools:write', schoolInputSchema, 'The school', createSchool],
  update: ['schools:write', schoolPatchSchema, updateSchool],
  remove: ['schools:write', deleteSchool],
});
