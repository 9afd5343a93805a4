import { recordRoutes } from '../core/routes';
import { getOutboxMessage, listOutbox, resendOutboxMessage } from './outbox-service';

/** `/api/outbox`: the coordinator sees every message, a director those of their schools. */
export const outboxRoutes = recordRoutes('/outbox', {
  read: ['outbox:read', listOutbox, getOutboxMessage],
  actions: { resend: ['outbox:read', resendOutboxMessage] },
});
