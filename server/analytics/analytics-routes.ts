import { Router } from 'express';
import { actorOf, requires, requiresAny } from '../core/policy';
import { parseId } from '../core/validate';
import type { Services } from '../services';
import { auditionReady, listAttainment } from './attainment-lists';
import { overview } from './overview-service';
import { studentProgress } from './progress-service';
import { retentionStudents, yearOverYear } from './year-over-year';

/** `/api/analytics`: the Overview's ladder figures, their drill-down lists, and a student's progress. */
export function analyticsRoutes({ db }: Services): Router {
  const router = Router();
  router.get('/analytics/overview', requires('pass-offs:read'), async (request, response) => {
    response.json(await overview(db, actorOf(request), request.query));
  });
  router.get('/analytics/students', requires('pass-offs:read'), async (request, response) => {
    response.json(await listAttainment(db, actorOf(request), request.query));
  });
  router.get('/analytics/audition-ready', requires('pass-offs:read'), async (request, response) => {
    response.json(await auditionReady(db, actorOf(request), request.query));
  });
  router.get('/analytics/year-over-year', requires('pass-offs:read'), async (request, response) => {
    response.json(await yearOverYear(db, actorOf(request), request.query));
  });
  router.get(
    '/analytics/retention/students',
    requires('pass-offs:read'),
    async (request, response) => {
      response.json(await retentionStudents(db, actorOf(request), request.query));
    },
  );
  router.get(
    '/analytics/students/:id/progress',
    requiresAny('pass-offs:read', 'self:read'),
    async (request, response) => {
      response.json(await studentProgress(db, actorOf(request), parseId(request.params['id'])));
    },
  );
  return router;
}
