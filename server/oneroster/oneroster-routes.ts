import { Router } from 'express';
import {
  orgMappingInputSchema,
  orgMappingKeySchema,
  syncRunInputSchema,
  syncSettingsInputSchema,
} from '@shared/api/oneroster';
import { actorOf, requires } from '../core/policy';
import { nothing, parseInput } from '../core/validate';
import type { Services } from '../services';
import { chooseOrgSchool, forgetOrgSchool, listOrgMappings } from './oneroster-queries';
import { readSyncSettings, runSync, saveSyncSettings } from './sync-service';

/**
 * `/api/oneroster`: the district's OneRoster orgs mapped to its schools. District-wide roster
 * settings, so the coordinator's alone (the capability that runs imports).
 */
export function oneRosterRoutes({ config, db, database }: Services): Router {
  const router = Router();
  const runs = requires('imports:run');

  router.get('/oneroster/org-mappings', runs, async (request, response) => {
    parseInput(nothing, request.query, 'The query');
    response.json(await listOrgMappings(db));
  });
  router.put('/oneroster/org-mappings', runs, async (request, response) => {
    const input = parseInput(orgMappingInputSchema, request.body, 'The org mapping');
    response.json(await chooseOrgSchool(db, actorOf(request), input));
  });
  router.delete('/oneroster/org-mappings/:sourcedId', runs, async (request, response) => {
    const { sourcedId } = parseInput(
      orgMappingKeySchema,
      { sourcedId: request.params['sourcedId'] },
      'The org',
    );
    await forgetOrgSchool(db, actorOf(request), sourcedId);
    response.status(204).end();
  });

  // The REST sync: its settings (the client secret is never answered) and a run now.
  router.get('/oneroster/sync', runs, async (request, response) => {
    parseInput(nothing, request.query, 'The query');
    response.json(await readSyncSettings(db));
  });
  router.put('/oneroster/sync', runs, async (request, response) => {
    const input = parseInput(syncSettingsInputSchema, request.body, 'The sync settings');
    response.json(await saveSyncSettings(db, config, actorOf(request), input));
  });
  router.post('/oneroster/sync/run', runs, async (request, response) => {
    const input = parseInput(syncRunInputSchema, request.body ?? {}, 'The sync run');
    const actor = actorOf(request);
    const run = await runSync(database, config, {
      ...input,
      actor,
      via: 'api',
    });
    response.json({ ...run.result, failure: run.failure ?? null });
  });
  return router;
}
