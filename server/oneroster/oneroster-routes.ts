import { Router } from 'express';
import { orgMappingInputSchema, orgMappingKeySchema } from '../../shared/api/oneroster';
import { actorOf, requires } from '../core/policy';
import { nothing, parseInput } from '../core/validate';
import type { Services } from '../services';
import { chooseOrgSchool, forgetOrgSchool, listOrgMappings } from './oneroster-queries';

/**
 * `/api/oneroster`: the district's OneRoster orgs mapped to its schools. District-wide roster
 * settings, so the coordinator's alone (the capability that runs imports).
 */
export function oneRosterRoutes({ db }: Services): Router {
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
  return router;
}
