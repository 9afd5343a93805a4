import { Router } from 'express';
import { reportScheduleInputSchema, reportSchedulePatchSchema } from '@shared/api/report';
import { actorOf, requires } from '../core/policy';
import { answer, idOf, recordRoutes, withoutActor } from '../core/routes';
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

/** `/api/reports/schedules`: the coordinator's report schedules. */
const schedules = recordRoutes('/reports/schedules', {
  read: ['reports:send', withoutActor(listSchedules), withoutActor(getSchedule)],
  create: ['reports:send', reportScheduleInputSchema, 'The schedule', createSchedule],
  update: ['reports:send', reportSchedulePatchSchema, updateSchedule],
  remove: ['reports:send', deleteSchedule],
});

/**
 * `/api/reports`: previews and the list of reports sent for anyone who reads reports; sending
 * for the coordinator (and for a director, to themselves); schedules for the coordinator.
 */
export function reportsRoutes(services: Services): Router {
  const { db } = services;
  const router = Router();
  const readsReports = requires('reports:read');
  router.get(
    '/reports',
    readsReports,
    answer((request, actor) => listReportRuns(db, actor, request.query)),
  );
  router.get(
    '/reports/preview',
    readsReports,
    answer((request, actor) => previewReport(db, actor, request.query)),
  );
  router.post('/reports/send', readsReports, async (request, response) => {
    const queued = await sendReport(db, actorOf(request), request.body);
    nudgeOutbox();
    response.status(202).json(queued);
  });
  schedules(services, router);
  router.get(
    '/reports/:id',
    readsReports,
    answer((request, actor) => getReportRun(db, actor, idOf(request))),
  );
  return router;
}
