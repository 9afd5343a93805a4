import { Router } from 'express';
import { actorOf, requires } from '../core/policy';
import { parseId } from '../core/validate';
import type { Services } from '../services';
import { getOutboxMessage, listOutbox, resendOutboxMessage } from './outbox-service';

/** `/api/outbox`: the coordinator sees every message, a director those of their schools. */
export function outboxRoutes({ db }: Services): Router {
  const router = Router();
  router.get('/outbox', requires('outbox:read'), async (request, response) => {
    response.json(await listOutbox(db, actorOf(request), request.query));
  });
  router.get('/outbox/:id', requires('outbox:read'), async (request, response) => {
    response.json(await getOutboxMessage(db, actorOf(request), parseId(request.params['id'])));
  });
  router.post('/outbox/:id/resend', requires('outbox:read'), async (request, response) => {
    response.json(await resendOutboxMessage(db, actorOf(request), parseId(request.params['id'])));
  });
  return router;
}
