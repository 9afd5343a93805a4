import Stripe from 'stripe';
import type { Config } from '../config';
import { HttpError } from '../core/errors';

const clients = new WeakMap<object, Stripe>();

/**
 * The hosted payment service's official SDK, or undefined when PAYMENTS_SECRET_KEY is not set
 * (fees are then recorded by hand). PAYMENTS_API_URL points it elsewhere with the SDK's
 * documented `host`, `port` and `protocol` options (the local fake in development and tests).
 */
export function paymentsClient(config: Config): Stripe | undefined {
  const payments = config.payments;
  if (!payments) return undefined;
  let client = clients.get(payments);
  if (!client) {
    const url = payments.apiUrl ? new URL(payments.apiUrl) : undefined;
    client = new Stripe(payments.secretKey, {
      ...(url
        ? {
            host: url.hostname,
            port: Number(url.port || (url.protocol === 'https:' ? 443 : 80)),
            protocol: url.protocol === 'http:' ? 'http' : 'https',
          }
        : {}),
      // One retry (the SDK sends the same idempotency key), and a short wait: a guardian is waiting.
      maxNetworkRetries: 1,
      timeout: 15_000,
      appInfo: { name: 'Tuttiboard' },
    });
    clients.set(payments, client);
  }
  return client;
}

/** The answer when the service cannot be reached or fails on its side. */
export const paymentsUnavailable = () =>
  new HttpError(503, 'payments_unavailable', 'Payments are unavailable, try later.');

/** Whether an SDK error means the service is down or failing (rather than refusing the request). */
export function isServiceDown(error: unknown): boolean {
  if (!(error instanceof Stripe.errors.StripeError)) return false;
  return (
    error instanceof Stripe.errors.StripeConnectionError ||
    error instanceof Stripe.errors.StripeAPIError ||
    error instanceof Stripe.errors.StripeRateLimitError ||
    (error.statusCode ?? 0) >= 500
  );
}
