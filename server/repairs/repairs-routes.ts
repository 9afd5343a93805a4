import type { Router } from 'express';
import { repairInputSchema, repairPatchSchema } from '@shared/api/repair';
import { recordRoutes } from '../core/routes';
import type { Services } from '../services';
import { createRepair, findRepair, listRepairs, updateRepair } from './repairs-service';

/** `/api/repairs`: everyone with a fleet view reads; technicians and the coordinator write. */
export function repairsRoutes({ db }: Services): Router {
  return recordRoutes(
    db,
    {
      path: '/repairs',
      capabilities: ['fleet:read', 'repairs:write'],
      input: [repairInputSchema, 'The repair ticket'],
      patch: repairPatchSchema,
    },
    { list: listRepairs, get: findRepair, create: createRepair, update: updateRepair },
  );
}
