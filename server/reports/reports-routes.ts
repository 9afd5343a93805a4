import { Router } from 'express';
import { reportScheduleInputSchema, reportSchedulePatchSchema } from '@shared/api/report';
import { actorOf, requires } from '../core/policy';
import { parseId, parseInput } from '../core/validate';
import type { Services } from '../services';
import { nudgeOutbox } from '../mail/outbox';
import { getReportRun, listReportRuns, previewReport, sendReport } from './reports-service';
import {
  createSchedule,
  deleteSchedule,
  getSchedule,
  listSchedules,
  updateSchedule,
} from './schedules-service';

/**
 * `/api/reports`: previews and the list of reports sent for anyone who reads reports; sending
 * for the coordinator (and for a director, to themselves); schedules for the coordinator.
 */
export function reportsRoutes({ db }: Services): Router {
  const router = Router();
  router.get('/reports', requires('reports:read'), async (request, response) => {
    response.json(await listReportRuns(db, actorOf(request), request.query));
  });
  router.get('/reports/preview', requires('reports:read'), async (request, response) => {
    response.json(await previewReport(db, actorOf(request), request.query));
  });
  router.post('/reports/send', requires('reports:read'), async (request, response) => {
    const queued = await sendReport(db, actorOf(request), request.body);
    nudgeOutbox();
    response.status(202).json(queued);
  });
  router.get('/reports/schedules', requires('reports:send'), async (request, response) => {
    response.json(await listSchedules(db, request.query));
  });
  router.get('/reports/schedules/:id', requires('reports:send'), async (request, response) => {
    response.json(await getSchedule(db, parseId(request.params['id'])));
  });
  router.post('/reports/schedules', requires('reports:send'), async (request, response) => {
    const input = parseInput(reportScheduleInputSchema, request.body, 'The schedule');
    response.status(201).json(await createSchedule(db, actorOf(request), input));
  });
  router.patch('/reports/schedules/:id', requires('reports:send'), async (request, response) => {
    const id = parseId(request.params['id']);
    const patch = parseInput(reportSchedulePatchSchema, request.body, 'The change');
    response.json(await updateSchedule(db, actorOf(request), id, patch));
  });
  router.delete('/reports/schedules/:id', requires('reports:send'), async (request, response) => {
    await deleteSchedule(db, actorOf(request), parseId(request.params['id']));
    response.status(204).end();
  });
  router.get('/reports/:id', requires('reports:read'), async (request, response) => {
    response.json(await getReportRun(db, actorOf(request), parseId(request.params['id'])));
  });
  return router;
}
