import { repairInputSchema, repairPatchSchema } from '@shared/api/repair';
import { recordRoutes } from '../core/routes';
import { createRepair, findRepair, listRepairs, updateRepair } from './repairs-service';

/** `/api/repairs`: everyone with a fleet view reads; technicians and the coordinator write. */
export const repairsRoutes = recordRoutes('/repairs', {
  read: ['fleet:read', listRepairs, findRepair],
  create: ['repairs:write', repairInputSchema, 'The repair ticket', createRepair],
  update: ['repairs:write', repairPatchSchema, updateRepair],
});
