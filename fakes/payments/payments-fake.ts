import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import express, { type NextFunction, type Request, type Response, type Router } from 'express';
import {
  ServiceError,
  unixNow,
  type CheckoutSession,
  type PaymentEvent,
  type Refund,
} from './payment-objects.js';
import { checkoutSessionRoutes } from './checkout-sessions.js';
import { hostedPageRoutes } from './hosted-page-routes.js';
import { idempotentRequests } from './idempotency.js';
import { PaymentLedger } from './payment-ledger.js';
import { refundRoutes } from './refunds.js';
import { WebhookSender, type Delivery } from './webhook-sender.js';

/** How to start the payment-service fake. */
export interface PaymentsFakeOptions {
  /** Port on 127.0.0.1; 0 picks a free one. Defaults to 4312. */
  port?: number;
  /** The secret API key callers must present. */
  secretKey?: string;
  /** The webhook signing secret. */
  webhookSecret?: string;
  /** Where signed events go (Tuttiboard's `/api/payments/webhook`). */
  webhookUrl?: string;
  /** Waits between webhook retries, in milliseconds. */
  retryDelaysMs?: number[];
}

/** A running fake. */
export interface PaymentsFake {
  /** The API's base address, such as `http://127.0.0.1:4312` (PAYMENTS_API_URL). */
  url: string;
  secretKey: string;
  webhookSecret: string;
  /** Points webhooks somewhere (once the app's address is known). */
  setWebhookUrl(url: string): void;
  /** Every session, oldest first. */
  sessions(): CheckoutSession[];
  refunds(): Refund[];
  events(): PaymentEvent[];
  deliveries(): Delivery[];
  /** Keeps events queued until `releaseWebhooks()`. */
  holdWebhooks(): void;
  releaseWebhooks(): void;
  /** Sends an already-sent event again. */
  resendEvent(eventId: string): boolean;
  /** Resolves when no delivery is in flight. */
  webhooksSettled(): Promise<void>;
  /** Pays a session as the hosted page does for this card number. */
  pay(sessionId: string, cardNumber: string): 'paid' | 'declined' | 'closed';
  /** Makes an open session's time run out now (as if its `expires_at` had passed). */
  timeOut(sessionId: string): void;
  close(): Promise<void>;
}

export { passesLuhn } from './hosted-page-routes.js';

/** The API the SDK calls: the secret key, form-encoded parameters, idempotency, the resources. */
function apiRoutes(secretKey: string, ledger: PaymentLedger): Router {
  const api = express.Router();
  api.use((request, _response, next) => {
    const header = request.headers.authorization ?? '';
    const key = header.startsWith('Bearer ') ? header.slice(7) : '';
    if (key !== secretKey) {
      throw new ServiceError(
        401,
        'invalid_request_error',
        key
          ? `Invalid API Key provided: ${key.slice(0, 8)}****`
          : 'You did not provide an API key.',
      );
    }
    next();
  });
  api.use(express.urlencoded({ extended: true, limit: '64kb', parameterLimit: 1000 }));
  api.use(idempotentRequests());
  checkoutSessionRoutes(api, ledger);
  refundRoutes(api, ledger);
  api.use((request) => {
    throw new ServiceError(
      404,
      'invalid_request_error',
      `Unrecognized request URL (${request.method}: ${request.path}).`,
    );
  });
  return api;
}

/** The service's error body for its own errors; anything else is an `api_error`. */
function answerError(
  error: unknown,
  _request: Request,
  response: Response,
  _next: NextFunction,
): void {
  if (error instanceof ServiceError) return void response.status(error.status).json(error.body());
  response.status(500).json({
    error: {
      type: 'api_error',
      message: error instanceof Error ? error.message : 'Something went wrong.',
    },
  });
}

/**
 * A local stand-in for the hosted payment service: the part of its HTTP API that the official SDK
 * calls for hosted checkout (sessions: create, read, list, expire; refunds: create, list), with the
 * service's error body and idempotency keys, a hosted payment page of our own, and signed webhooks
 * with retries. State lives in memory.
 */
export async function startPaymentsFake(options: PaymentsFakeOptions = {}): Promise<PaymentsFake> {
  const secretKey = options.secretKey ?? 'sk_test_tuttiboard_local';
  const webhookSecret = options.webhookSecret ?? 'whsec_tuttiboard_local';
  const sender = new WebhookSender({
    secret: webhookSecret,
    url: options.webhookUrl,
    retryDelaysMs: options.retryDelaysMs,
  });
  const ledger = new PaymentLedger(sender);
  const app = express();
  app.disable('x-powered-by');
  app.set('etag', false);
  hostedPageRoutes(app, ledger);
  app.use(apiRoutes(secretKey, ledger));
  app.use(answerError);

  const server: Server = createServer(app);
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port ?? 4312, '127.0.0.1', () => resolve());
  });
  const baseUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  ledger.baseUrl = baseUrl;
  const sweep = setInterval(
    () => ledger.sessions.forEach((session) => ledger.expireIfDue(session)),
    5_000,
  );
  sweep.unref();

  return {
    url: baseUrl,
    secretKey,
    webhookSecret,
    setWebhookUrl: (url) => {
      sender.url = url;
    },
    sessions: () => [...ledger.sessions.values()].map((session) => structuredClone(session)),
    refunds: () => ledger.refunds.map((refund) => structuredClone(refund)),
    events: () => sender.events(),
    deliveries: () => sender.deliveries(),
    holdWebhooks: () => sender.hold(),
    releaseWebhooks: () => sender.release(),
    resendEvent: (eventId) => sender.resend(eventId),
    webhooksSettled: () => sender.settled(),
    pay: (sessionId, cardNumber) => {
      const session = ledger.sessions.get(sessionId);
      if (!session) throw new Error(`No session ${sessionId}`);
      return ledger.pay(session, cardNumber.replace(/\s/g, ''));
    },
    timeOut: (sessionId) => {
      const session = ledger.sessions.get(sessionId);
      if (!session) throw new Error(`No session ${sessionId}`);
      session.expires_at = unixNow();
      ledger.expireIfDue(session);
    },
    close: async () => {
      clearInterval(sweep);
      sender.close();
      await new Promise<void>((resolve) => {
        server.close(() => resolve());
        server.closeAllConnections();
      });
    },
  };
}
