import { Router } from 'express';
import {
  ladderDraftInputSchema,
  ladderImpactStudentsQuerySchema,
  ladderPatchSchema,
  ladderPublishInputSchema,
} from '@shared/api/ladder';
import { ladderImpact, ladderImpactStudents } from './ladder-impact';
import { actorOf, requires } from '../core/policy';
import { nothing, parseId, parseInput } from '../core/validate';
import type { Services } from '../services';
import { rebuildAttainment } from './attainment';
import { refreshStatistics, summaryTables } from '../db/statistics';
import { recordAudit } from '../core/audit';
import {
  createDraft,
  deleteDraft,
  getActiveLadder,
  getVersion,
  listVersions,
  publishVersion,
  restoreVersion,
  updateDraft,
} from './ladder-service';

/** `/api/ladder`: everyone reads the active ladder; the coordinator drafts and publishes versions. */
export function ladderRoutes({ db }: Services): Router {
  const router = Router();
  router.get('/ladder', requires('ladder:read'), async (request, response) => {
    parseInput(nothing, request.query, 'The query');
    response.json(await getActiveLadder(db));
  });
  router.get('/ladder/versions', requires('ladder:read'), async (request, response) => {
    response.json(await listVersions(db, actorOf(request), request.query));
  });
  router.get('/ladder/versions/:id', requires('ladder:read'), async (request, response) => {
    response.json(await getVersion(db, actorOf(request), parseId(request.params['id'])));
  });
  router.post('/ladder/versions', requires('ladder:write'), async (request, response) => {
    const input = parseInput(ladderDraftInputSchema, request.body ?? {}, 'The draft');
    response.status(201).json(await createDraft(db, actorOf(request), input));
  });
  router.patch('/ladder/versions/:id', requires('ladder:write'), async (request, response) => {
    const id = parseId(request.params['id']);
    const patch = parseInput(ladderPatchSchema, request.body, 'The ladder');
    response.json(await updateDraft(db, actorOf(request), id, patch));
  });
  router.delete('/ladder/versions/:id', requires('ladder:write'), async (request, response) => {
    await deleteDraft(db, actorOf(request), parseId(request.params['id']));
    response.status(204).end();
  });
  router.get('/ladder/versions/:id/impact', requires('ladder:write'), async (request, response) => {
    response.json(await ladderImpact(db, parseId(request.params['id'])));
  });
  router.get(
    '/ladder/versions/:id/impact/students',
    requires('ladder:write'),
    async (request, response) => {
      const filter = parseInput(ladderImpactStudentsQuerySchema, request.query, 'The filter');
      const rows = await ladderImpactStudents(db, parseId(request.params['id']), filter);
      response.json({ rows, total: rows.length });
    },
  );
  router.post(
    '/ladder/versions/:id/publish',
    requires('ladder:write'),
    async (request, response) => {
      const input = parseInput(ladderPublishInputSchema, request.body ?? {}, 'The publish');
      response.json(
        await publishVersion(db, actorOf(request), parseId(request.params['id']), input),
      );
    },
  );
  router.post(
    '/ladder/versions/:id/restore',
    requires('ladder:write'),
    async (request, response) => {
      const input = parseInput(ladderPublishInputSchema, request.body ?? {}, 'The roll-back');
      response.json(
        await restoreVersion(db, actorOf(request), parseId(request.params['id']), input),
      );
    },
  );
  // Seats and instruments change through the roster; this brings every rung up to date with them.
  router.post('/ladder/attainment/rebuild', requires('ladder:write'), async (request, response) => {
    parseInput(nothing, request.body ?? {}, 'The request');
    await db.transaction(async (tx) => {
      await rebuildAttainment(tx);
      await recordAudit(tx, actorOf(request), {
        action: 'rebuild',
        entity: 'student-attainment',
        entityId: 'all',
      });
    });
    await refreshStatistics(db, summaryTables);
    response.status(204).end();
  });
  return router;
}
