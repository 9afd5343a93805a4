import type { Router } from 'express';
import {
  invalidParameter,
  missingParameter,
  objectId,
  ServiceError,
  unixNow,
  type CheckoutSession,
} from './payment-objects.js';
import { integer, listPage, metadata, text, type Params } from './fake-params.js';
import { publicSession, type PaymentLedger } from './payment-ledger.js';

type LineItem = CheckoutSession['line_items_summary'][number];

/** One priced line item (`line_items[index]`) and its currency, which must be the earlier items'. */
function lineItem(
  raw: unknown,
  index: number,
  earlierCurrency: string | undefined,
): LineItem & { currency: string } {
  const item = (raw ?? {}) as Params;
  const priceData = (item['price_data'] ?? undefined) as Params | undefined;
  if (!priceData) throw missingParameter(`line_items[${index}][price_data]`);
  const currency = text(priceData, 'currency')?.toLowerCase();
  if (!currency || !/^[a-z]{3}$/.test(currency))
    throw missingParameter(`line_items[${index}][price_data][currency]`);
  if (earlierCurrency && earlierCurrency !== currency)
    throw invalidParameter(
      `line_items[${index}][price_data][currency]`,
      'All line items must use the same currency.',
    );
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
  return { name, quantity, unit_amount: unitAmount, currency };
}

/** The line items, their one currency and their total. */
function lineItems(params: Params): { items: LineItem[]; currency: string; total: number } {
  const rawItems = params['line_items'];
  if (!Array.isArray(rawItems) || rawItems.length === 0) throw missingParameter('line_items');
  let currency: string | undefined;
  let total = 0;
  const items = rawItems.map((raw: unknown, index) => {
    const { currency: itemCurrency, ...item } = lineItem(raw, index, currency);
    currency = itemCurrency;
    total += item.unit_amount * item.quantity;
    return item;
  });
  // The service's smallest charge in US dollars is 50 cents.
  if (total < 50)
    throw invalidParameter(
      'line_items',
      "The Checkout Session's total amount due must add up to at least $0.50 usd",
    );
  return { items, currency: currency!, total };
}

/** Creates an open session from the API's parameters. */
function createSession(ledger: PaymentLedger, params: Params): CheckoutSession {
  const mode = text(params, 'mode');
  if (!mode) throw missingParameter('mode');
  if (mode !== 'payment') throw invalidParameter('mode', 'This fake supports mode "payment" only.');
  const successUrl = text(params, 'success_url');
  if (!successUrl) throw missingParameter('success_url');
  const { items, currency, total } = lineItems(params);
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
    currency,
    metadata: metadata(params, 'metadata'),
    client_reference_id: text(params, 'client_reference_id') ?? null,
    customer_email: text(params, 'customer_email') ?? null,
    success_url: successUrl,
    cancel_url: text(params, 'cancel_url') ?? null,
    url: `${ledger.baseUrl}/pay/${id}`,
    payment_intent: null,
    created,
    expires_at: expiresAt,
    livemode: false,
    line_items_summary: items,
    payment_intent_metadata: metadata((params['payment_intent_data'] ?? {}) as Params, 'metadata'),
  };
  ledger.sessions.set(id, session);
  return session;
}

/** Checkout sessions: create, list, read, expire. */
export function checkoutSessionRoutes(api: Router, ledger: PaymentLedger): void {
  api.post('/v1/checkout/sessions', (request, response) => {
    response.json(publicSession(createSession(ledger, request.body ?? {})));
  });
  api.get('/v1/checkout/sessions', (request, response) => {
    const query = request.query as Params;
    const all = [...ledger.sessions.values()];
    all.forEach((session) => ledger.expireIfDue(session));
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
    response.json(publicSession(ledger.findSession(request.params['id'] as string)));
  });
  api.post('/v1/checkout/sessions/:id/expire', (request, response) => {
    const session = ledger.findSession(request.params['id'] as string);
    if (session.status !== 'open')
      throw new ServiceError(
        400,
        'invalid_request_error',
        `Only Checkout Sessions with a status of open can be expired. This Checkout Session has a status of ${session.status}.`,
        'checkout_session_not_open',
      );
    ledger.expire(session);
    response.json(publicSession(session));
  });
}
