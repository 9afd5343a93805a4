import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import Stripe from 'stripe';
import { passesLuhn, startPaymentsFake, type PaymentsFake } from './index';

let fake: PaymentsFake;
let client: Stripe;

const session = (amount = 4500): Stripe.Checkout.SessionCreateParams => ({
  mode: 'payment',
  line_items: [
    {
      quantity: 1,
      price_data: { currency: 'usd', unit_amount: amount, product_data: { name: 'Usage fee' } },
    },
  ],
  success_url: 'http://127.0.0.1/done?session_id={CHECKOUT_SESSION_ID}',
  metadata: { loanId: '7' },
});

beforeAll(async () => {
  fake = await startPaymentsFake({ port: 0 });
  const url = new URL(fake.url);
  client = new Stripe(fake.secretKey, {
    host: url.hostname,
    port: Number(url.port),
    protocol: 'http',
    maxNetworkRetries: 0,
  });
});
afterAll(() => fake?.close());

describe('payments fake, through the official SDK', () => {
  it('should answer the same session for a repeated idempotency key, and an idempotency error for other parameters', async () => {
    const first = await client.checkout.sessions.create(session(), {
      idempotencyKey: 'loan-7-attempt-1',
    });
    const again = await client.checkout.sessions.create(session(), {
      idempotencyKey: 'loan-7-attempt-1',
    });
    expect(again.id).toBe(first.id);
    expect(again.lastResponse.headers['idempotent-replayed']).toBe('true');
    const other = client.checkout.sessions.create(session(5000), {
      idempotencyKey: 'loan-7-attempt-1',
    });
    await expect(other).rejects.toBeInstanceOf(Stripe.errors.StripeIdempotencyError);
    expect(fake.sessions()).toHaveLength(1);
  });

  it('should answer a missing parameter and an unknown session in the service error shape', async () => {
    const missing = await client.checkout.sessions
      .create({ mode: 'payment', success_url: 'http://x' })
      .catch((error: unknown) => error);
    expect(missing).toBeInstanceOf(Stripe.errors.StripeInvalidRequestError);
    expect((missing as Stripe.errors.StripeError).code).toBe('parameter_missing');
    expect((missing as Stripe.errors.StripeError).param).toBe('line_items');
    const unknown = await client.checkout.sessions
      .retrieve('cs_test_nope')
      .catch((error: unknown) => error);
    expect((unknown as Stripe.errors.StripeError).statusCode).toBe(404);
    expect((unknown as Stripe.errors.StripeError).code).toBe('resource_missing');
  });

  it('should refuse a wrong API key with 401', async () => {
    const url = new URL(fake.url);
    const stranger = new Stripe('sk_test_wrong_key', {
      host: url.hostname,
      port: Number(url.port),
      protocol: 'http',
      maxNetworkRetries: 0,
    });
    await expect(stranger.checkout.sessions.list()).rejects.toBeInstanceOf(
      Stripe.errors.StripeAuthenticationError,
    );
  });

  it('should pay with 4242…, decline 4000…0002, and refund no more than was paid', async () => {
    const declined = await client.checkout.sessions.create(session());
    expect(fake.pay(declined.id, '4000 0000 0000 0002')).toBe('declined');
    expect((await client.checkout.sessions.retrieve(declined.id)).status).toBe('open');
    const paid = await client.checkout.sessions.create(session());
    expect(fake.pay(paid.id, '4242 4242 4242 4242')).toBe('paid');
    const read = await client.checkout.sessions.retrieve(paid.id);
    expect(read.payment_status).toBe('paid');
    const paymentIntent = read.payment_intent as string;
    await client.refunds.create({ payment_intent: paymentIntent, amount: 4000 });
    const tooMuch = await client.refunds
      .create({ payment_intent: paymentIntent, amount: 1000 })
      .catch((error: unknown) => error);
    expect((tooMuch as Stripe.errors.StripeError).code).toBe('amount_too_large');
    const listed = await client.refunds.list({ payment_intent: paymentIntent });
    expect(listed.data.map((refund) => refund.amount)).toEqual([4000]);
    const expired = await client.checkout.sessions.expire(declined.id);
    expect(expired.status).toBe('expired');
    expect(fake.pay(declined.id, '4242424242424242')).toBe('closed');
  });

  it('should list sessions newest first across pages', async () => {
    const all = await client.checkout.sessions.list({ limit: 1 }).autoPagingToArray({ limit: 100 });
    expect(all.map((each) => each.id)).toEqual(
      fake
        .sessions()
        .map((each) => each.id)
        .reverse(),
    );
  });
});

describe('Luhn check', () => {
  it('should accept the published test numbers and refuse a changed digit', () => {
    // ISO/IEC 7812-1 check digit; the payment service's published test card numbers pass it.
    expect(passesLuhn('4242424242424242')).toBe(true);
    expect(passesLuhn('4000000000000002')).toBe(true);
    expect(passesLuhn('4242424242424241')).toBe(false);
  });
});
