import { integer, index, pgTable, text, uniqueIndex } from 'drizzle-orm/pg-core';
import { attemptStatuses, feeScopes, ledgerKinds } from '../../../shared/api/fee';
import { identity, timestamps, moment, linkTo } from './columns';
import { actedBy } from './people';
import { loans } from './fleet';
import { schools } from './schools';

/** The yearly usage fee of an instrument family or of one instrument. */
export const feeSchedule = pgTable(
  'fee_schedule',
  {
    ...identity,
    scope: text('scope', { enum: feeScopes }).notNull(),
    key: text('key').notNull(),
    yearlyFeeCents: integer('yearly_fee_cents').notNull(),
    ...timestamps,
  },
  (table) => [uniqueIndex('fee_schedule_scope_key_unique').on(table.scope, table.key)],
);

/** One hosted checkout session opened for a loan's fee (attempt 1, 2… per loan). */
export const feePaymentAttempts = pgTable(
  'fee_payment_attempts',
  {
    ...identity,
    loanId: linkTo('loan_id', () => loans.id),
    attempt: integer('attempt').notNull(),
    sessionId: text('session_id').notNull(),
    amountCents: integer('amount_cents').notNull(),
    currency: text('currency').notNull(),
    status: text('status', { enum: attemptStatuses }).notNull().default('open'),
    paymentIntentId: text('payment_intent_id'),
    note: text('note'),
    settledAt: moment('settled_at'),
    ...timestamps,
  },
  (table) => [
    uniqueIndex('fee_payment_attempts_session_unique').on(table.sessionId),
    uniqueIndex('fee_payment_attempts_loan_attempt_unique').on(table.loanId, table.attempt),
    index('fee_payment_attempts_intent_idx').on(table.paymentIntentId),
  ],
);

/** Money in and out for loan fees; a refund or payment from the service is recorded once. */
export const feeLedger = pgTable(
  'fee_ledger',
  {
    ...identity,
    loanId: linkTo('loan_id', () => loans.id),
    schoolId: linkTo('school_id', () => schools.id),
    kind: text('kind', { enum: ledgerKinds }).notNull(),
    amountCents: integer('amount_cents').notNull(),
    currency: text('currency').notNull().default('usd'),
    /** The service's payment intent (payments, mismatches) or refund id (refunds). */
    reference: text('reference'),
    attemptId: integer('attempt_id').references(() => feePaymentAttempts.id),
    reason: text('reason'),
    recordedBy: actedBy('recorded_by'),
    at: moment('at').notNull().defaultNow(),
  },
  (table) => [
    uniqueIndex('fee_ledger_kind_reference_unique').on(table.kind, table.reference),
    index('fee_ledger_loan_idx').on(table.loanId),
  ],
);

/** Every webhook event handled, so a replayed or duplicated one changes nothing. */
export const paymentEvents = pgTable('payment_events', {
  eventId: text('event_id').primaryKey(),
  type: text('type').notNull(),
  outcome: text('outcome').notNull().default(''),
  receivedAt: moment('received_at').notNull().defaultNow(),
});
