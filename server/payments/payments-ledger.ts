import type { Transaction } from '../db/client';
import { feeLedger } from '../db/schema/index';
import type { LoanRow } from '../loans/loans-queries';
import { queueFeeReceipt } from './fee-mail';

/** Fees are charged in US dollars; amounts are in cents (the currency's minor unit). */
export const feeCurrency = 'usd';

/** The id of the payment intent an object of the service names, expanded or not. */
export function paymentIntentOf(
  paymentIntent: string | { id: string } | null | undefined,
): string | null {
  return typeof paymentIntent === 'string' ? paymentIntent : (paymentIntent?.id ?? null);
}

/**
 * Writes one entry of a loan's fee ledger, once (a repeated entry is a no-op: false), and queues
 * the guardian's receipt for a payment or a refund.
 */
export async function recordLedger(
  tx: Transaction,
  row: LoanRow,
  entry: {
    kind: 'payment' | 'manual-payment' | 'refund' | 'mismatch';
    amountCents: number;
    currency: string;
    reference: string | null;
    attemptId?: number | null;
    reason?: string | null;
    recordedBy?: number | null;
  },
): Promise<boolean> {
  const inserted = await tx
    .insert(feeLedger)
    .values({ loanId: row.loan.id, schoolId: row.loan.schoolId, ...entry })
    .onConflictDoNothing()
    .returning({ id: feeLedger.id, at: feeLedger.at });
  if (inserted.length === 0) return false;
  if (entry.kind === 'payment' || entry.kind === 'refund') {
    await queueFeeReceipt(tx, row, {
      kind: entry.kind,
      amountCents: entry.amountCents,
      reference: entry.reference,
      reason: entry.reason,
      at: inserted[0]!.at,
    });
  }
  return true;
}

/** A refund the payment service made against one payment attempt, written to the fee ledger. */
export function recordRefund(
  tx: Transaction,
  row: LoanRow,
  refund: { id: string; amount: number; currency: string },
  attemptId: number,
  reason: string,
  recordedBy: number | null = null,
): Promise<boolean> {
  return recordLedger(tx, row, {
    kind: 'refund',
    amountCents: refund.amount,
    currency: refund.currency,
    reference: refund.id,
    attemptId,
    reason,
    recordedBy,
  });
}
