import { eq, max } from 'drizzle-orm';
import type Stripe from 'stripe';
import type { Config } from '../config';
import type { Database } from '../db/client';
import { feePaymentAttempts } from '../db/schema/index';
import { feeRowOf } from './fees-queries';
import { isServiceDown, paymentsClient, paymentsUnavailable } from './payments-client';
import { feeCurrency } from './payments-ledger';

/** What asking to pay did. */
export type CheckoutOutcome =
  | { state: 'redirect'; url: string; sessionId: string }
  | { state: 'nothing-owed'; status: string }
  | { state: 'disabled' };

/**
 * Opens a hosted checkout session for what the loan still owes, as the server computes it, with
 * the loan and student as metadata and the idempotency key `loan-<id>-attempt-<n>`: a retried
 * request (the SDK's own retry, or two tabs asking at the same moment) gets the same session
 * back. A paid, waived or refunded loan gets no session. The service unreachable: 503, nothing kept.
 */
export async function startCheckout(
  db: Database,
  config: Config,
  loanId: number,
  urls: { success: string; cancel: string },
): Promise<CheckoutOutcome> {
  const client = paymentsClient(config);
  if (!client) return { state: 'disabled' };
  const fee = await feeRowOf(db, loanId);
  if (fee.owedCents <= 0) return { state: 'nothing-owed', status: fee.status };
  const [last] = await db
    .select({ attempt: max(feePaymentAttempts.attempt) })
    .from(feePaymentAttempts)
    .where(eq(feePaymentAttempts.loanId, loanId));
  const attempt = (last?.attempt ?? 0) + 1;
  const metadata = {
    loanId: String(loanId),
    studentId: String(fee.studentId),
    attempt: String(attempt),
  };
  let session: Stripe.Checkout.Session;
  try {
    session = await client.checkout.sessions.create(
      {
        mode: 'payment',
        line_items: [
          {
            quantity: 1,
            price_data: {
              currency: feeCurrency,
              unit_amount: fee.owedCents,
              product_data: {
                name: `Instrument usage fee${fee.schoolYear ? ` ${fee.schoolYear}` : ''}: ${fee.instrumentName} ${fee.assetTag}`,
              },
            },
          },
        ],
        client_reference_id: `loan-${loanId}`,
        metadata,
        payment_intent_data: { metadata },
        success_url: urls.success,
        cancel_url: urls.cancel,
      },
      { idempotencyKey: `loan-${loanId}-attempt-${attempt}` },
    );
  } catch (error) {
    if (isServiceDown(error)) throw paymentsUnavailable();
    throw error;
  }
  if (!session.url) throw paymentsUnavailable();
  await db
    .insert(feePaymentAttempts)
    .values({
      loanId,
      attempt,
      sessionId: session.id,
      amountCents: fee.owedCents,
      currency: feeCurrency,
    })
    .onConflictDoNothing();
  return { state: 'redirect', url: session.url, sessionId: session.id };
}
