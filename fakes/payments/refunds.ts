import type { Router } from 'express';
import {
  invalidParameter,
  missingParameter,
  noSuch,
  objectId,
  ServiceError,
  unixNow,
  type Charge,
  type Refund,
} from './payment-objects.js';
import { integer, listPage, metadata, text, type Params } from './fake-params.js';
import type { PaymentLedger } from './payment-ledger.js';

/** The charge a refund names, by payment intent or by charge id. */
function refundedCharge(ledger: PaymentLedger, params: Params): Charge {
  const paymentIntent = text(params, 'payment_intent');
  const chargeId = text(params, 'charge');
  if (!paymentIntent && !chargeId) throw missingParameter('payment_intent');
  const charge = paymentIntent
    ? ledger.charges.get(paymentIntent)
    : [...ledger.charges.values()].find((candidate) => candidate.id === chargeId);
  if (!charge)
    throw paymentIntent
      ? noSuch('payment_intent', paymentIntent, 'payment_intent')
      : noSuch('charge', chargeId!, 'charge');
  return charge;
}

/** The amount to refund: what is asked, at most what is left on the charge; all of it by default. */
function refundAmount(charge: Charge, params: Params): number {
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
  return amount;
}

/** Refunds (part of) a charge and sends `charge.refunded` with the charge's refunds. */
function createRefund(ledger: PaymentLedger, params: Params): Refund {
  const charge = refundedCharge(ledger, params);
  const amount = refundAmount(charge, params);
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
  ledger.refunds.push(refund);
  charge.amount_refunded += amount;
  charge.refunded = charge.amount_refunded >= charge.amount;
  ledger.emit('charge.refunded', {
    ...charge,
    refunds: {
      object: 'list',
      data: ledger.refunds.filter((each) => each.charge === charge.id).reverse(),
      has_more: false,
    },
  });
  return refund;
}

/** Refunds: create, list. */
export function refundRoutes(api: Router, ledger: PaymentLedger): void {
  api.post('/v1/refunds', (request, response) => {
    response.json(createRefund(ledger, request.body ?? {}));
  });
  api.get('/v1/refunds', (request, response) => {
    const query = request.query as Params;
    const paymentIntent = text(query, 'payment_intent');
    response.json(
      listPage(
        ledger.refunds.filter(
          (refund) => !paymentIntent || refund.payment_intent === paymentIntent,
        ),
        query,
        '/v1/refunds',
      ),
    );
  });
}
