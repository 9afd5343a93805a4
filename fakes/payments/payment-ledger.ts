import {
  noSuch,
  objectId,
  unixNow,
  type CheckoutSession,
  type Charge,
  type PaymentEvent,
  type Refund,
} from './payment-objects.js';
import type { WebhookSender } from './webhook-sender.js';

// The service's published test card number that pays.
export const payingCard = '4242424242424242';
const apiVersion = '2026-11-18';

/** A session as the API shows it: without the fake's own bookkeeping fields. */
export function publicSession(session: CheckoutSession) {
  const { line_items_summary: _items, payment_intent_metadata: _metadata, ...rest } = session;
  return rest;
}

/** The fake's state, in memory: sessions, the charges their payments made, refunds, and events. */
export class PaymentLedger {
  readonly sessions = new Map<string, CheckoutSession>();
  /** Charges by payment intent. */
  readonly charges = new Map<string, Charge>();
  readonly refunds: Refund[] = [];
  /** The API's base address, known once the server listens. */
  baseUrl = '';

  constructor(private readonly sender: WebhookSender) {}

  /** Sends an event of this type about this object through the webhook sender. */
  emit(type: string, object: unknown, idempotencyKey: string | null = null): void {
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
    this.sender.send(event);
  }

  /** Expires a session whose time ran out; the service does this on its own schedule. */
  expireIfDue(session: CheckoutSession): void {
    if (session.status === 'open' && session.expires_at <= unixNow()) this.expire(session);
  }

  expire(session: CheckoutSession): void {
    session.status = 'expired';
    session.url = null;
    this.emit('checkout.session.expired', publicSession(session));
  }

  findSession(id: string): CheckoutSession {
    const session = this.sessions.get(id);
    if (!session) throw noSuch('checkout.session', id, 'session');
    this.expireIfDue(session);
    return session;
  }

  pay(session: CheckoutSession, card: string): 'paid' | 'declined' | 'closed' {
    this.expireIfDue(session);
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
    this.charges.set(paymentIntent, charge);
    session.status = 'complete';
    session.payment_status = 'paid';
    session.payment_intent = paymentIntent;
    session.url = null;
    this.emit('checkout.session.completed', publicSession(session));
    return 'paid';
  }
}
