import { Router } from 'express';
import {
  schoolYearInputSchema,
  schoolYearPatchSchema,
  yearStartInputSchema,
} from '@shared/api/school-year';
import { actorOf, requires } from '../core/policy';
import { nothing, parseId, parseInput } from '../core/validate';
import type { Services } from '../services';
import { createSchoolYear, listSchoolYears, updateSchoolYear } from './school-years-service';
import { startSchoolYear } from './year-start';

/** `/api/school-years`: every signed-in user reads; the coordinator adds, edits and starts. */
export function schoolYearsRoutes({ db }: Services): Router {
  const router = Router();
  router.get('/school-years', async (request, response) => {
    actorOf(request);
    parseInput(nothing, request.query, 'The query');
    response.json(await listSchoolYears(db));
  });
  router.post('/school-years', requires('years:write'), async (request, response) => {
    const input = parseInput(schoolYearInputSchema, request.body, 'The school year');
    response.status(201).json(await createSchoolYear(db, actorOf(request), input));
  });
  router.patch('/school-years/:id', requires('years:write'), async (request, response) => {
    const id = parseId(request.params['id']);
    const patch = parseInput(schoolYearPatchSchema, request.body, 'The change');
    response.json(await updateSchoolYear(db, actorOf(request), id, patch));
  });
  router.post('/school-years/start/preview', requires('years:write'), async (request, response) => {
    const input = parseInput(yearStartInputSchema, request.body, 'The new year');
    response.json(await startSchoolYear(db, actorOf(request), input, { commit: false }));
  });
  router.post('/school-years/start', requires('years:write'), async (request, response) => {
    const input = parseInput(yearStartInputSchema, request.body, 'The new year');
    response.status(201).json(await startSchoolYear(db, actorOf(request), input, { commit: true }));
  });
  return router;
}
