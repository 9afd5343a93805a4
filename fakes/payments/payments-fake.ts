import { createHash } from 'node:crypto';
import { createServer, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import express, { type NextFunction, type Request, type Response } from 'express';
import {
  invalidParameter,
  missingParameter,
  noSuch,
  objectId,
  ServiceError,
  unixNow,
  type CheckoutSession,
  type Charge,
  type PaymentEvent,
  type Refund,
} from './payment-objects.js';
import { closedPage, paymentForm } from './hosted-page.js';
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

// The service's published test card numbers (always declined: its generic decline card).
const payingCard = '4242424242424242';
const declinedCard = '4000000000000002';
const apiVersion = '2026-11-18';
const idempotencyWindowMs = 24 * 60 * 60 * 1000;

/** The Luhn check digit test (ISO/IEC 7812-1 Annex B). */
export function passesLuhn(digits: string): boolean {
  let sum = 0;
  for (let index = 0; index < digits.length; index += 1) {
    let digit = Number(digits[digits.length - 1 - index]);
    if (index % 2 === 1) {
      digit *= 2;
      if (digit > 9) digit -= 9;
    }
    sum += digit;
  }
  return digits.length >= 12 && sum % 10 === 0;
}

type Params = Record<string, unknown>;

function text(params: Params, name: string): string | undefined {
  const value = params[name];
  return typeof value === 'string' ? value : undefined;
}

function integer(params: Params, name: string, param = name): number | undefined {
  const value = params[name];
  if (value === undefined) return undefined;
  if (typeof value !== 'string' || !/^\d+$/.test(value))
    throw invalidParameter(param, `Invalid integer: ${String(value)}`);
  return Number(value);
}

function metadata(params: Params, name: string): Record<string, string> {
  const value = params[name];
  if (value === undefined || value === '') return {};
  if (typeof value !== 'object' || value === null || Array.isArray(value))
    throw invalidParameter(name, 'Invalid object');
  const entries = Object.entries(value as Record<string, unknown>);
  if (entries.length > 50) throw invalidParameter(name, 'Metadata can have up to 50 keys.');
  for (const [key, entry] of entries) {
    if (typeof entry !== 'string' || key.length > 40 || entry.length > 500)
      throw invalidParameter(
        `${name}[${key}]`,
        'Metadata keys are at most 40 characters and values at most 500.',
      );
  }
  return value as Record<string, string>;
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
  const sessions = new Map<string, CheckoutSession>();
  const charges = new Map<string, Charge>();
  const refunds: Refund[] = [];
  const idempotency = new Map<
    string,
    { fingerprint: string; status: number; body: unknown; at: number }
  >();
  const sender = new WebhookSender({
    secret: webhookSecret,
    url: options.webhookUrl,
    retryDelaysMs: options.retryDelaysMs,
  });
  let baseUrl = '';

  const emit = (type: string, object: unknown, idempotencyKey: string | null = null) => {
    const event: PaymentEvent = {
      id: objectId('evt'),
      object: 'event',
      api_version: apiVersion,
      created: unixNow(),
      type,
      data: { object: structuredClone(object) },
      livemode: false,
      pending_webhooks: 1,
      request: { id: null, idempotency_key: idempotencyKey },
    };
    sender.send(event);
  };

  const publicSession = (session: CheckoutSession) => {
    const { line_items_summary: _items, payment_intent_metadata: _metadata, ...rest } = session;
    return rest;
  };

  /** Expires a session whose time ran out; the service does this on its own schedule. */
  const expireIfDue = (session: CheckoutSession) => {
    if (session.status === 'open' && session.expires_at <= unixNow()) expire(session);
  };
  const expire = (session: CheckoutSession) => {
    session.status = 'expired';
    session.url = null;
    emit('checkout.session.expired', publicSession(session));
  };

  const findSession = (id: string) => {
    const session = sessions.get(id);
    if (!session) throw noSuch('checkout.session', id, 'session');
    expireIfDue(session);
    return session;
  };

  const pay = (session: CheckoutSession, card: string): 'paid' | 'declined' | 'closed' => {
    expireIfDue(session);
    if (session.status !== 'open') return 'closed';
    if (card !== payingCard) return 'declined';
    const paymentIntent = objectId('pi');
    const charge: Charge = {
      id: objectId('ch'),
      object: 'charge',
      amount: session.amount_total,
      amount_captured: session.amount_total,
      amount_refunded: 0,
      refunded: false,
      paid: true,
      status: 'succeeded',
      currency: session.currency,
      payment_intent: paymentIntent,
      metadata: { ...session.payment_intent_metadata },
      created: unixNow(),
      livemode: false,
    };
    charges.set(paymentIntent, charge);
    session.status = 'complete';
    session.payment_status = 'paid';
    session.payment_intent = paymentIntent;
    session.url = null;
    emit('checkout.session.completed', publicSession(session));
    return 'paid';
  };

  const createSession = (params: Params): CheckoutSession => {
    const mode = text(params, 'mode');
    if (!mode) throw missingParameter('mode');
    if (mode !== 'payment')
      throw invalidParameter('mode', 'This fake supports mode "payment" only.');
    const successUrl = text(params, 'success_url');
    if (!successUrl) throw missingParameter('success_url');
    const rawItems = params['line_items'];
    if (!Array.isArray(rawItems) || rawItems.length === 0) throw missingParameter('line_items');
    let currency: string | undefined;
    let total = 0;
    const items = rawItems.map((raw: unknown, index) => {
      const item = (raw ?? {}) as Params;
      const priceData = (item['price_data'] ?? undefined) as Params | undefined;
      if (!priceData) throw missingParameter(`line_items[${index}][price_data]`);
      const itemCurrency = text(priceData, 'currency')?.toLowerCase();
      if (!itemCurrency || !/^[a-z]{3}$/.test(itemCurrency))
        throw missingParameter(`line_items[${index}][price_data][currency]`);
      if (currency && currency !== itemCurrency)
        throw invalidParameter(
          `line_items[${index}][price_data][currency]`,
          'All line items must use the same currency.',
        );
      currency = itemCurrency;
      const unitAmount = integer(
        priceData,
        'unit_amount',
        `line_items[${index}][price_data][unit_amount]`,
      );
      if (unitAmount === undefined)
        throw missingParameter(`line_items[${index}][price_data][unit_amount]`);
      const product = (priceData['product_data'] ?? {}) as Params;
      const name = text(product, 'name');
      if (!name) throw missingParameter(`line_items[${index}][price_data][product_data][name]`);
      const quantity = integer(item, 'quantity', `line_items[${index}][quantity]`) ?? 1;
      if (quantity < 1)
        throw invalidParameter(`line_items[${index}][quantity]`, 'Quantity must be at least 1.');
      total += unitAmount * quantity;
      return { name, quantity, unit_amount: unitAmount };
    });
    // The service's smallest charge in US dollars is 50 cents.
    if (total < 50)
      throw invalidParameter(
        'line_items',
        "The Checkout Session's total amount due must add up to at least $0.50 usd",
      );
    const created = unixNow();
    const expiresAt = integer(params, 'expires_at') ?? created + 24 * 60 * 60;
    if (expiresAt < created + 30 * 60 || expiresAt > created + 24 * 60 * 60)
      throw invalidParameter(
        'expires_at',
        'The `expires_at` timestamp must be between 30 minutes and 24 hours from Checkout Session creation.',
      );
    const id = objectId('cs_test');
    const session: CheckoutSession = {
      id,
      object: 'checkout.session',
      mode: 'payment',
      status: 'open',
      payment_status: 'unpaid',
      amount_subtotal: total,
      amount_total: total,
      currency: currency!,
      metadata: metadata(params, 'metadata'),
      client_reference_id: text(params, 'client_reference_id') ?? null,
      customer_email: text(params, 'customer_email') ?? null,
      success_url: successUrl,
      cancel_url: text(params, 'cancel_url') ?? null,
      url: `${baseUrl}/pay/${id}`,
      payment_intent: null,
      created,
      expires_at: expiresAt,
      livemode: false,
      line_items_summary: items,
      payment_intent_metadata: metadata(
        (params['payment_intent_data'] ?? {}) as Params,
        'metadata',
      ),
    };
    sessions.set(id, session);
    return session;
  };

  const createRefund = (params: Params): Refund => {
    const paymentIntent = text(params, 'payment_intent');
    const chargeId = text(params, 'charge');
    if (!paymentIntent && !chargeId) throw missingParameter('payment_intent');
    const charge = paymentIntent
      ? charges.get(paymentIntent)
      : [...charges.values()].find((candidate) => candidate.id === chargeId);
    if (!charge)
      throw paymentIntent
        ? noSuch('payment_intent', paymentIntent, 'payment_intent')
        : noSuch('charge', chargeId!, 'charge');
    const remaining = charge.amount - charge.amount_refunded;
    if (remaining <= 0)
      throw new ServiceError(
        400,
        'invalid_request_error',
        `Charge ${charge.id} has already been refunded.`,
        'charge_already_refunded',
      );
    const amount = integer(params, 'amount') ?? remaining;
    if (amount < 1) throw invalidParameter('amount', 'Refund amount must be positive.');
    if (amount > remaining)
      throw new ServiceError(
        400,
        'invalid_request_error',
        `Refund amount (${amount}) is greater than unrefunded amount on charge (${remaining})`,
        'amount_too_large',
        'amount',
      );
    const reason = text(params, 'reason') ?? null;
    if (reason && !['duplicate', 'fraudulent', 'requested_by_customer'].includes(reason))
      throw invalidParameter(
        'reason',
        'Invalid reason: must be one of duplicate, fraudulent, or requested_by_customer',
      );
    const refund: Refund = {
      id: objectId('re'),
      object: 'refund',
      amount,
      currency: charge.currency,
      payment_intent: charge.payment_intent,
      charge: charge.id,
      status: 'succeeded',
      reason,
      metadata: metadata(params, 'metadata'),
      created: unixNow(),
    };
    refunds.push(refund);
    charge.amount_refunded += amount;
    charge.refunded = charge.amount_refunded >= charge.amount;
    emit('charge.refunded', {
      ...charge,
      refunds: {
        object: 'list',
        data: refunds.filter((each) => each.charge === charge.id).reverse(),
        has_more: false,
      },
    });
    return refund;
  };

  /** A list page, newest first, with the service's cursor parameters. */
  const listPage = <Item extends { id: string }>(all: Item[], params: Params, path: string) => {
    const limit = Math.min(Math.max(integer(params, 'limit') ?? 10, 1), 100);
    const newestFirst = [...all].reverse();
    const after = text(params, 'starting_after');
    let start = 0;
    if (after) {
      const index = newestFirst.findIndex((item) => item.id === after);
      if (index < 0) throw invalidParameter('starting_after', `No such object: '${after}'`);
      start = index + 1;
    }
    const data = newestFirst.slice(start, start + limit);
    return { object: 'list', url: path, has_more: start + limit < newestFirst.length, data };
  };

  const app = express();
  app.disable('x-powered-by');
  app.set('etag', false);

  // The hosted payment page.
  app.get('/pay/:id', (request, response): void => {
    const session = sessions.get(request.params['id'] ?? '');
    response.set('Cache-Control', 'no-store').type('html');
    if (!session) {
      response
        .status(404)
        .send(closedPage('Payment page not found', 'This payment link is not valid.'));
      return;
    }
    expireIfDue(session);
    if (session.status === 'complete')
      return void response.send(
        closedPage(
          'Already paid',
          'This payment has been made. Thank you.',
          session.success_url?.replaceAll('{CHECKOUT_SESSION_ID}', session.id),
        ),
      );
    if (session.status === 'expired')
      return void response
        .status(410)
        .send(
          closedPage(
            'This payment page has expired',
            'Go back to the site you came from to start again.',
            session.cancel_url,
          ),
        );
    response.send(paymentForm(session));
  });
  app.post(
    '/pay/:id',
    express.urlencoded({ extended: false, limit: '4kb' }),
    (request, response): void => {
      const session = sessions.get(request.params['id'] ?? '');
      response.set('Cache-Control', 'no-store').type('html');
      if (!session)
        return void response
          .status(404)
          .send(closedPage('Payment page not found', 'This payment link is not valid.'));
      const body = (request.body ?? {}) as Record<string, string>;
      const card = String(body['card'] ?? '').replace(/[\s-]/g, '');
      if (!/^\d{12,19}$/.test(card) || !passesLuhn(card))
        return void response
          .status(400)
          .send(paymentForm(session, 'Your card number is incorrect.'));
      if (!/^\s*(0[1-9]|1[0-2])\s*\/?\s*\d{2}\s*$/.test(String(body['expiry'] ?? '')))
        return void response
          .status(400)
          .send(paymentForm(session, 'Your card’s expiry date is incomplete.'));
      if (!/^\d{3,4}$/.test(String(body['cvc'] ?? '').trim()))
        return void response
          .status(400)
          .send(paymentForm(session, 'Your card’s security code is incomplete.'));
      const outcome = pay(session, card);
      if (outcome === 'closed')
        return void response
          .status(410)
          .send(
            closedPage(
              'This payment page can no longer be used',
              session.status === 'complete'
                ? 'This payment has already been made.'
                : 'It has expired. Go back to start again.',
              session.cancel_url,
            ),
          );
      if (outcome === 'declined')
        return void response
          .status(402)
          .send(
            paymentForm(
              session,
              card === declinedCard
                ? 'Your card was declined.'
                : 'Your card was declined. Use one of the test cards below.',
            ),
          );
      response.redirect(303, session.success_url!.replaceAll('{CHECKOUT_SESSION_ID}', session.id));
    },
  );

  // The API the SDK calls.
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
  // Idempotency: the same key with the same request answers what it answered the first time; the
  // same key with other parameters is an error.
  api.use((request, response, next) => {
    const key = request.headers['idempotency-key'];
    if (request.method !== 'POST' || typeof key !== 'string') return next();
    if (key.length > 255)
      throw invalidParameter('Idempotency-Key', 'Idempotency keys are at most 255 characters.');
    const fingerprint = createHash('sha256')
      .update(`${request.path}\n${JSON.stringify(request.body ?? {})}`)
      .digest('hex');
    const now = Date.now();
    for (const [stored, entry] of idempotency)
      if (now - entry.at > idempotencyWindowMs) idempotency.delete(stored);
    const earlier = idempotency.get(key);
    if (earlier) {
      if (earlier.fingerprint !== fingerprint) {
        throw new ServiceError(
          400,
          'idempotency_error',
          `Keys for idempotent requests can only be used with the same parameters they were first used with. Try using a key other than '${key}' if you meant to execute a different request.`,
        );
      }
      response
        .set('Idempotent-Replayed', 'true')
        .set('Idempotency-Key', key)
        .status(earlier.status)
        .json(earlier.body);
      return;
    }
    const json = response.json.bind(response);
    response.json = (body: unknown) => {
      // Answers to bad parameters are not kept (the service keeps only requests that began executing).
      if (response.statusCode < 400 || response.statusCode >= 500)
        idempotency.set(key, { fingerprint, status: response.statusCode, body, at: now });
      response.set('Idempotency-Key', key);
      return json(body);
    };
    next();
  });
  api.post('/v1/checkout/sessions', (request, response) => {
    response.json(publicSession(createSession(request.body ?? {})));
  });
  api.get('/v1/checkout/sessions', (request, response) => {
    const query = request.query as Params;
    const all = [...sessions.values()];
    all.forEach(expireIfDue);
    const paymentIntent = text(query, 'payment_intent');
    const status = text(query, 'status');
    const filtered = all.filter(
      (session) =>
        (!paymentIntent || session.payment_intent === paymentIntent) &&
        (!status || session.status === status),
    );
    const page = listPage(filtered, query, '/v1/checkout/sessions');
    response.json({ ...page, data: page.data.map(publicSession) });
  });
  api.get('/v1/checkout/sessions/:id', (request, response) => {
    response.json(publicSession(findSession(request.params['id'] as string)));
  });
  api.post('/v1/checkout/sessions/:id/expire', (request, response) => {
    const session = findSession(request.params['id'] as string);
    if (session.status !== 'open')
      throw new ServiceError(
        400,
        'invalid_request_error',
        `Only Checkout Sessions with a status of open can be expired. This Checkout Session has a status of ${session.status}.`,
        'checkout_session_not_open',
      );
    expire(session);
    response.json(publicSession(session));
  });
  api.post('/v1/refunds', (request, response) => {
    response.json(createRefund(request.body ?? {}));
  });
  api.get('/v1/refunds', (request, response) => {
    const query = request.query as Params;
    const paymentIntent = text(query, 'payment_intent');
    response.json(
      listPage(
        refunds.filter((refund) => !paymentIntent || refund.payment_intent === paymentIntent),
        query,
        '/v1/refunds',
      ),
    );
  });
  api.use((request) => {
    throw new ServiceError(
      404,
      'invalid_request_error',
      `Unrecognized request URL (${request.method}: ${request.path}).`,
    );
  });
  app.use(api);
  app.use((error: unknown, _request: Request, response: Response, _next: NextFunction): void => {
    if (error instanceof ServiceError) return void response.status(error.status).json(error.body());
    response.status(500).json({
      error: {
        type: 'api_error',
        message: error instanceof Error ? error.message : 'Something went wrong.',
      },
    });
  });

  const server: Server = createServer(app);
  await new Promise<void>((resolve, reject) => {
    server.once('error', reject);
    server.listen(options.port ?? 4312, '127.0.0.1', () => resolve());
  });
  baseUrl = `http://127.0.0.1:${(server.address() as AddressInfo).port}`;
  const sweep = setInterval(() => sessions.forEach(expireIfDue), 5_000);
  sweep.unref();

  return {
    url: baseUrl,
    secretKey,
    webhookSecret,
    setWebhookUrl: (url) => {
      sender.url = url;
    },
    sessions: () => [...sessions.values()].map((session) => structuredClone(session)),
    refunds: () => refunds.map((refund) => structuredClone(refund)),
    events: () => sender.events(),
    deliveries: () => sender.deliveries(),
    holdWebhooks: () => sender.hold(),
    releaseWebhooks: () => sender.release(),
    resendEvent: (eventId) => sender.resend(eventId),
    webhooksSettled: () => sender.settled(),
    pay: (sessionId, cardNumber) => {
      const session = sessions.get(sessionId);
      if (!session) throw new Error(`No session ${sessionId}`);
      return pay(session, cardNumber.replace(/\s/g, ''));
    },
    timeOut: (sessionId) => {
      const session = sessions.get(sessionId);
      if (!session) throw new Error(`No session ${sessionId}`);
      session.expires_at = unixNow();
      expireIfDue(session);
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
