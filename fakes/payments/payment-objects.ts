import { randomBytes } from 'node:crypto';

/** An identifier in the service's style: a type prefix and random characters. */
export function objectId(prefix: string): string {
  return `${prefix}_${randomBytes(18).toString('base64url').replace(/[-_]/g, 'x')}`;
}

/** Seconds since the epoch, as the service's timestamps are. */
export function unixNow(): number {
  return Math.floor(Date.now() / 1000);
}

/** A hosted checkout session (mode "payment", one or more priced line items). */
export interface CheckoutSession {
  id: string;
  object: 'checkout.session';
  mode: 'payment';
  status: 'open' | 'complete' | 'expired';
  payment_status: 'unpaid' | 'paid';
  amount_subtotal: number;
  amount_total: number;
  currency: string;
  metadata: Record<string, string>;
  client_reference_id: string | null;
  customer_email: string | null;
  success_url: string | null;
  cancel_url: string | null;
  url: string | null;
  payment_intent: string | null;
  created: number;
  expires_at: number;
  livemode: false;
  line_items_summary: { name: string; quantity: number; unit_amount: number }[];
  payment_intent_metadata: Record<string, string>;
}

/** A refund of (part of) a payment. */
export interface Refund {
  id: string;
  object: 'refund';
  amount: number;
  currency: string;
  payment_intent: string;
  charge: string;
  status: 'succeeded';
  reason: string | null;
  metadata: Record<string, string>;
  created: number;
}

/** The charge behind a paid session. */
export interface Charge {
  id: string;
  object: 'charge';
  amount: number;
  amount_captured: number;
  amount_refunded: number;
  refunded: boolean;
  paid: true;
  status: 'succeeded';
  currency: string;
  payment_intent: string;
  metadata: Record<string, string>;
  created: number;
  livemode: false;
}

/** What an event carries. */
export interface PaymentEvent {
  id: string;
  object: 'event';
  api_version: string;
  created: number;
  type: string;
  data: { object: unknown };
  livemode: false;
  pending_webhooks: number;
  request: { id: string | null; idempotency_key: string | null };
}

/** The service's error body: `{ error: { type, code?, param?, message } }`. */
export class ServiceError extends Error {
  constructor(
    readonly status: number,
    readonly type: string,
    message: string,
    readonly code?: string,
    readonly param?: string,
  ) {
    super(message);
  }

  body() {
    return {
      error: {
        type: this.type,
        message: this.message,
        ...(this.code ? { code: this.code } : {}),
        ...(this.param ? { param: this.param } : {}),
      },
    };
  }
}

export const missingParameter = (param: string) =>
  new ServiceError(
    400,
    'invalid_request_error',
    `Missing required param: ${param}.`,
    'parameter_missing',
    param,
  );

export const invalidParameter = (param: string, message: string) =>
  new ServiceError(400, 'invalid_request_error', message, 'parameter_invalid', param);

export const noSuch = (kind: string, id: string, param = 'id') =>
  new ServiceError(
    404,
    'invalid_request_error',
    `No such ${kind}: '${id}'`,
    'resource_missing',
    param,
  );
