import { Router } from 'express';
import { replacementQuerySchema } from '@shared/api/planning';
import { actorOf, assertInScope, requires } from '../core/policy';
import { plannedInstruments } from './planning-queries';
import { nothing, parseInput } from '../core/validate';
import type { Services } from '../services';
import { todayIso } from '../loans/school-calendar';
import { replacementPlan } from './replacement-plan';
import { shortageReport } from './shortages';

/** `/api/planning`: the replacement plan and the shortages of district-provided instruments. */
export function planningRoutes({ db }: Services): Router {
  const router = Router();
  router.get('/planning/replacement', requires('fleet:read'), async (request, response) => {
    const actor = actorOf(request);
    const query = parseInput(replacementQuerySchema, request.query, 'The planning query');
    if (query.homeSchoolId !== undefined) assertInScope(actor, query.homeSchoolId, 'That school');
    const rows = await plannedInstruments(db, actor, query.homeSchoolId);
    response.json(replacementPlan(rows, query.asOf ?? todayIso()));
  });
  router.get('/planning/shortages', requires('fleet:read'), async (request, response) => {
    parseInput(nothing, request.query, 'The query');
    response.json(await shortageReport(db, actorOf(request)));
  });
  return router;
}
