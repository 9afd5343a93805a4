import * as z from 'zod';
import { schoolRefFields, studentLinkFields } from './fields';
import { idParameter, plainText } from './input-rules';

/** What a fee-schedule entry prices: a whole instrument family, or one instrument. */
export const feeScopes = ['family', 'instrument'] as const;

/** How a loan's usage fee stands. */
export const feeStatuses = [
  'none',
  'owed',
  'part-paid',
  'paid',
  'waived',
  'refunded',
  'mismatch',
] as const;
export type FeeStatus = (typeof feeStatuses)[number];

/** Kinds of ledger entries: money in, money out, and money in that did not match the fee. */
export const ledgerKinds = ['payment', 'manual-payment', 'refund', 'mismatch'] as const;

/** Where a hosted checkout attempt ended. */
export const attemptStatuses = [
  'open',
  'paid',
  'expired',
  'mismatch',
  'superseded',
  'duplicate-refunded',
  'duplicate-refund-failed',
] as const;

export const feeScheduleEntrySchema = z.object({
  scope: z.enum(feeScopes),
  /** A family ('brass') or a music-engine instrument id ('tuba'). */
  key: plainText().min(1).max(60),
  yearlyFeeCents: z.number().int().min(0).max(1_000_000),
});
export type FeeScheduleEntry = z.infer<typeof feeScheduleEntrySchema>;

/**
 * The district's fee schedule: yearly fees, the optional rule for a second (or later) loan in the
 * same school year, and the waiver reasons offered at checkout.
 */
export const feeScheduleSchema = z.object({
  entries: z.array(feeScheduleEntrySchema).max(200),
  additionalLoan: z
    .object({
      /** 'student': the same student's second instrument; 'household': a sibling's (same guardian e-mail). */
      basis: z.enum(['student', 'household']),
      /** The share of the fee the second and later loans pay, 0–100. */
      percent: z.number().int().min(0).max(100),
    })
    .nullable(),
  waiverReasons: z.array(plainText().min(2).max(120)).max(30),
  /** Whether online payment is configured on this server (read-only). */
  onlinePayments: z.boolean().optional(),
  version: z.number().int().optional(),
});
export type FeeSchedule = z.infer<typeof feeScheduleSchema>;

/** One loan's fee, as the Fees screen lists it. `waiverReason` only for coordinator and directors. */
export const feeRowSchema = z.object({
  loanId: z.number().int(),
  ...studentLinkFields,
  ...schoolRefFields,
  schoolYear: z.string().nullable(),
  assetTag: z.string(),
  instrumentName: z.string(),
  checkedOutOn: z.string(),
  feeCents: z.number().int(),
  paidCents: z.number().int(),
  refundedCents: z.number().int(),
  owedCents: z.number().int(),
  mismatchCents: z.number().int(),
  waived: z.boolean(),
  waiverReason: z.string().nullable().optional(),
  status: z.enum(feeStatuses),
});
export type FeeRow = z.infer<typeof feeRowSchema>;

export const feeTotalsSchema = z.object({
  feeCents: z.number().int(),
  paidCents: z.number().int(),
  refundedCents: z.number().int(),
  owedCents: z.number().int(),
  waivedLoans: z.number().int(),
  loans: z.number().int(),
});

export const feeListSchema = z.object({
  rows: z.array(feeRowSchema),
  total: z.number().int(),
  totals: feeTotalsSchema,
});
export type FeeList = z.infer<typeof feeListSchema>;

/** Totals grouped by student, school or school year. */
export const feeSummarySchema = z.object({
  by: z.enum(['student', 'school', 'year']),
  groups: z.array(feeTotalsSchema.extend({ key: z.string(), label: z.string() })),
});
export type FeeSummary = z.infer<typeof feeSummarySchema>;

export const ledgerEntrySchema = z.object({
  id: z.number().int(),
  kind: z.enum(ledgerKinds),
  amountCents: z.number().int(),
  currency: z.string(),
  reference: z.string().nullable(),
  reason: z.string().nullable(),
  at: z.string(),
});

export const paymentAttemptSchema = z.object({
  attempt: z.number().int(),
  sessionId: z.string(),
  amountCents: z.number().int(),
  currency: z.string(),
  status: z.enum(attemptStatuses),
  note: z.string().nullable(),
  createdAt: z.string(),
});

/** One loan's ledger: its fee row, the money entries and the hosted checkout attempts. */
export const feeDetailSchema = z.object({
  fee: feeRowSchema,
  ledger: z.array(ledgerEntrySchema),
  attempts: z.array(paymentAttemptSchema),
});
export type FeeDetail = z.infer<typeof feeDetailSchema>;

export const refundInputSchema = z.object({
  /** Leave out for the whole refundable amount. */
  amountCents: z.number().int().positive().max(1_000_000).optional(),
  reason: plainText().min(3, 'Give a reason for the refund.').max(500),
});
export type RefundInput = z.infer<typeof refundInputSchema>;

export const manualPaymentInputSchema = z.object({
  amountCents: z.number().int().positive().max(1_000_000),
  /** Cash, cheque number… */
  note: plainText().min(2).max(500),
});

export const feeFiltersSchema = z.object({
  schoolId: idParameter.optional(),
  studentId: idParameter.optional(),
  status: z.enum(feeStatuses).optional(),
  year: plainText().max(20).optional(),
});

/** One line of the reconciliation: the service's record against ours. */
export const reconciliationRowSchema = z.object({
  sessionId: z.string().nullable(),
  paymentIntent: z.string().nullable(),
  loanId: z.number().int().nullable(),
  serviceAmountCents: z.number().int(),
  serviceRefundedCents: z.number().int(),
  ledgerPaidCents: z.number().int(),
  ledgerRefundedCents: z.number().int(),
  currency: z.string(),
  ok: z.boolean(),
  problem: z.string().nullable(),
});
export const reconciliationSchema = z.object({
  rows: z.array(reconciliationRowSchema),
  mismatches: z.number().int(),
});
export type Reconciliation = z.infer<typeof reconciliationSchema>;

/** `GET /api/fees/quote`: the scheduled fee for lending this instrument to this student today. */
export const feeQuoteQuerySchema = z.strictObject({
  instrumentId: idParameter,
  studentId: idParameter,
});

/** `feeCents` null: no schedule line covers the instrument, so the fee is entered by hand. */
export const feeQuoteSchema = z.object({
  feeCents: z.number().int().nullable(),
  basis: z.string(),
  waiverReasons: z.array(z.string()),
});
export type FeeQuote = z.infer<typeof feeQuoteSchema>;
