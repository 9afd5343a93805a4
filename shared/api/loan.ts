import * as z from 'zod';
import { schoolRefFields, studentLinkFields } from './fields';
import { calendarDate, idParameter, plainText, recordId } from './input-rules';
import { instrumentConditions } from './instrument';

/** Where a loan is: out, back, or written off as lost (the record is kept). */
export const loanStates = ['active', 'returned', 'lost'] as const;
export type LoanState = (typeof loanStates)[number];

const dateText = calendarDate('Write the date as YYYY-MM-DD.');

/**
 * One loan of a district instrument to a student. `instrumentId` is the fleet row's id;
 * `instrumentType` the music engine's id. `waiverReason` is present only for the coordinator
 * and directors.
 */
export const loanSchema = z.object({
  id: z.number().int(),
  instrumentId: z.number().int(),
  assetTag: z.string(),
  instrumentType: z.string(),
  instrumentName: z.string(),
  ...studentLinkFields,
  ...schoolRefFields,
  checkedOutOn: z.string(),
  dueOn: z.string(),
  accessories: z.array(z.string()),
  conditionOut: z.enum(instrumentConditions),
  conditionIn: z.enum(instrumentConditions).nullable(),
  returnedOn: z.string().nullable(),
  usageFeeCents: z.number().int(),
  waiver: z.boolean(),
  waiverReason: z.string().nullable().optional(),
  state: z.enum(loanStates),
  overdue: z.boolean(),
  /** Whether the guardian has signed the agreement. */
  signed: z.boolean(),
  signedName: z.string().nullable(),
  signedAt: z.string().nullable(),
  agreementExpiresAt: z.string().nullable(),
  agreementTextVersion: z.number().int().nullable(),
  /** SHA-256 (hex) of the exact agreement text the guardian signed. */
  agreementTextHash: z.string().nullable(),
  /** Safety cautions for this instrument (heavy handling, wind cleaning). */
  cautions: z.array(z.string()),
  version: z.number().int(),
});
export type Loan = z.infer<typeof loanSchema>;

/** What a director sends to check an instrument out to a student. */
export const checkoutInputSchema = z.strictObject({
  instrumentId: recordId(),
  studentId: recordId(),
  /** Defaults to the last day of the current school year. */
  dueOn: dateText.optional(),
  accessories: z.array(plainText().min(1).max(80)).max(20).default([]),
  conditionOut: z.enum(instrumentConditions),
  usageFeeCents: z.number().int().min(0).max(1_000_000).default(0),
  waiver: z.boolean().default(false),
  waiverReason: plainText().max(500).optional(),
});
export type CheckoutInput = z.infer<typeof checkoutInputSchema>;

/**
 * What a return sends: the condition it came back in, and damage or loss when there is some. A
 * lost instrument needs no condition.
 */
export const returnInputSchema = z.strictObject({
  /** Required unless the instrument is lost. */
  conditionIn: z.enum(instrumentConditions).optional(),
  damaged: z.object({ problem: plainText().min(3).max(2000) }).optional(),
  lost: z.boolean().optional(),
  notes: plainText().max(2000).optional(),
});
export type ReturnInput = z.infer<typeof returnInputSchema>;

/** The field filters of `GET /api/loans`. */
export const loanFiltersSchema = z.strictObject({
  state: z.enum(loanStates).optional(),
  overdue: z.enum(['true', 'false']).optional(),
  unsigned: z.enum(['true', 'false']).optional(),
  schoolId: idParameter.optional(),
  studentId: idParameter.optional(),
  instrumentId: idParameter.optional(),
});

/** The fields `GET /api/loans` sorts on. */
export const loanSortFields = [
  'checkedOutOn',
  'dueOn',
  'returnedOn',
  'assetTag',
  'studentName',
  'schoolCode',
  'state',
] as const;

/** How many reminder e-mails were queued. */
export const reminderResultSchema = z.object({ queued: z.number().int() });
export type ReminderResult = z.infer<typeof reminderResultSchema>;

/** The loan agreement text guardians sign; `version` goes up with every change. */
export const agreementTextSchema = z.object({
  text: z.string(),
  version: z.number().int(),
  updatedAt: z.string().nullable(),
});
export type AgreementText = z.infer<typeof agreementTextSchema>;

/** What the coordinator sends to change the agreement text. */
export const agreementTextInputSchema = z.strictObject({
  text: plainText().min(40, 'The agreement needs real text.').max(20_000),
});
