import { Router } from 'express';
import { countCloseSchema, countScanInputSchema, countStartSchema } from '@shared/api/count';
import { actorOf, requires } from '../core/policy';
import { parseId, parseInput } from '../core/validate';
import type { Services } from '../services';
import { closeCount, countDetail, listCounts, recordScan, startCount } from './counts-service';

/** `/api/counts`: the annual inventory count; directors count their schools, technicians any. */
export function countsRoutes({ db }: Services): Router {
  const router = Router();
  router.get('/counts', requires('fleet:read'), async (request, response) => {
    response.json(await listCounts(db, actorOf(request), request.query));
  });
  router.post('/counts', requires('counts:run'), async (request, response) => {
    const { schoolId } = parseInput(countStartSchema, request.body, 'The count');
    response.status(201).json(await startCount(db, actorOf(request), schoolId));
  });
  router.get('/counts/:id', requires('fleet:read'), async (request, response) => {
    response.json(await countDetail(db, actorOf(request), parseId(request.params['id'])));
  });
  router.post('/counts/:id/scans', requires('counts:run'), async (request, response) => {
    const { assetTag } = parseInput(countScanInputSchema, request.body, 'The scan');
    response
      .status(201)
      .json(await recordScan(db, actorOf(request), parseId(request.params['id']), assetTag));
  });
  router.post('/counts/:id/close', requires('counts:run'), async (request, response) => {
    const { confirmMissing } = parseInput(countCloseSchema, request.body ?? {}, 'The close');
    response.json(
      await closeCount(db, actorOf(request), parseId(request.params['id']), confirmMissing),
    );
  });
  return router;
}
