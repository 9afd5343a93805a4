import { Router, type Request } from 'express';
import { gridNamePattern, gridPreferenceInputSchema } from '@shared/api/grid-preference';
import { badRequest } from '../core/errors';
import { actorOf } from '../core/policy';
import { nothing, parseInput } from '../core/validate';
import type { Services } from '../services';
import {
  clearGridPreference,
  getGridPreference,
  saveGridPreference,
} from './grid-preferences-service';

function gridOf(request: Request): string {
  const grid = request.params['grid'];
  if (typeof grid !== 'string' || !gridNamePattern.test(grid)) {
    throw badRequest('A grid name is lower-case letters, digits and dashes, e.g. students.', [
      { field: 'grid', message: 'Not a grid name.' },
    ]);
  }
  return grid;
}

/**
 * `/api/grid-preferences/:grid`: each signed-in user's own remembered grid layout (columns
 * shown, their order and widths). Every role may keep its own; nobody sees another's.
 */
export function gridPreferencesRoutes({ db }: Services): Router {
  const router = Router();
  router.get('/grid-preferences/:grid', async (request, response) => {
    parseInput(nothing, request.query, 'The query');
    response.json(await getGridPreference(db, actorOf(request), gridOf(request)));
  });
  router.put('/grid-preferences/:grid', async (request, response) => {
    const actor = actorOf(request);
    const grid = gridOf(request);
    const { state } = parseInput(gridPreferenceInputSchema, request.body, 'The grid layout');
    response.json(await saveGridPreference(db, actor, grid, state));
  });
  router.delete('/grid-preferences/:grid', async (request, response) => {
    await clearGridPreference(db, actorOf(request), gridOf(request));
    response.status(204).end();
  });
  return router;
}
