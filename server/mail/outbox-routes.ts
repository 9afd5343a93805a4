import { Router } from 'express';
import { requires } from '../core/policy';
import { answer, idOf, recordRoutes } from '../core/routes';
import type { Services } from '../services';
import { getOutboxMessage, listOutbox, resendOutboxMessage } from './outbox-service';

/** `/api/outbox`: the coordinator sees every message, a director those of their schools. */
export function outboxRoutes({ db }: Services): Router {
  const router = recordRoutes(
    db,
    { path: '/outbox', capabilities: ['outbox:read', 'outbox:read'] },
    { list: listOutbox, get: getOutboxMessage },
  );
  router.post(
    '/outbox/:id/resend',
    requires('outbox:read'),
    answer((request, actor) => resendOutboxMessage(db, actor, idOf(request))),
  );
  return router;
}
