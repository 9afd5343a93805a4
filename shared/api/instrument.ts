import * as z from 'zod';
import { homeSchoolFields, studentLinkFields, versionedFields } from './fields';
import { calendarDate, idParameter, plainText, recordId, patchSchemaOf } from './input-rules';
import { instruments } from '../music/index';

/** Condition grades of a district instrument, best first (common practice, no source). */
export const instrumentConditions = ['excellent', 'good', 'fair', 'poor', 'unserviceable'] as const;
export type InstrumentCondition = (typeof instrumentConditions)[number];

/**
 * Where an instrument is in its life. `to-clean`: back from a loan and waiting to be cleaned and
 * sanitised before it may be lent again.
 */
export const instrumentStatuses = [
  'available',
  'on-loan',
  'in-repair',
  'missing',
  'retired',
  'to-clean',
] as const;
export type InstrumentStatus = (typeof instrumentStatuses)[number];

/** The statuses a person may set by hand; loans, repairs and counts set the others. */
export const manualInstrumentStatuses = ['available', 'missing', 'retired'] as const;

/** What an instrument's timeline records. */
export const instrumentEventKinds = [
  'purchase',
  /** Added to the fleet with no known purchase date (read from a 'purchase' entry). */
  'added',
  'loan-out',
  'return',
  'repair-open',
  'repair-close',
  'condition-change',
  'cleaned',
  'count-found',
  'marked-missing',
] as const;
export type InstrumentEventKind = (typeof instrumentEventKinds)[number];

const instrumentIds = instruments.map((instrument) => instrument.id);
const dateText = calendarDate('Write the date as YYYY-MM-DD.');

/** One district-owned instrument as the API answers it. */
export const instrumentSchema = z.object({
  id: z.number().int(),
  assetTag: z.string(),
  /** The music engine's instrument id ('tuba', 'alto-sax'…). */
  instrumentId: z.string(),
  instrumentName: z.string(),
  family: z.string(),
  maker: z.string(),
  model: z.string(),
  serial: z.string(),
  purchasedOn: z.string().nullable(),
  purchaseCostCents: z.number().int().nullable(),
  fundingSource: z.string(),
  condition: z.enum(instrumentConditions),
  status: z.enum(instrumentStatuses),
  ...homeSchoolFields,
  location: z.string(),
  notes: z.string(),
  ...versionedFields,
  /** How to move it safely, for heavy instruments; null otherwise. */
  handlingNote: z.string().nullable(),
  /** The cleaning caution for a shared wind instrument; null otherwise. */
  cleaningCaution: z.string().nullable(),
});
export type Instrument = z.infer<typeof instrumentSchema>;

/** One entry of an instrument's timeline. */
export const instrumentEventSchema = z.object({
  id: z.number().int(),
  kind: z.enum(instrumentEventKinds),
  at: z.string(),
  note: z.string(),
  userName: z.string().nullable(),
  loanId: z.number().int().nullable(),
  repairId: z.number().int().nullable(),
  countId: z.number().int().nullable(),
  /** The student of the loan the entry is about, for those who may see the student. */
  studentName: z.string().nullable(),
  studentNumber: z.string().nullable(),
});
export type InstrumentEvent = z.infer<typeof instrumentEventSchema>;

/** A photo of an instrument; `url` answers the image itself. */
export const instrumentPhotoSchema = z.object({
  id: z.number().int(),
  contentType: z.string(),
  sizeBytes: z.number().int(),
  url: z.string(),
  createdAt: z.string(),
});
export type InstrumentPhoto = z.infer<typeof instrumentPhotoSchema>;

/** The loan an instrument is out on, as its detail page shows it. */
export const instrumentActiveLoanSchema = z.object({
  id: z.number().int(),
  ...studentLinkFields,
  schoolId: z.number().int(),
  checkedOutOn: z.string(),
  dueOn: z.string(),
  overdue: z.boolean(),
  signed: z.boolean(),
});

/** An open repair ticket, as an instrument's detail page shows it. */
export const instrumentOpenRepairSchema = z.object({
  id: z.number().int(),
  problem: z.string(),
  status: z.string(),
  vendor: z.string().nullable(),
  sentOn: z.string().nullable(),
});

/** One instrument with its timeline, photos, active loan and open repairs. */
export const instrumentDetailSchema = instrumentSchema.extend({
  timeline: z.array(instrumentEventSchema),
  photos: z.array(instrumentPhotoSchema),
  activeLoan: instrumentActiveLoanSchema.nullable(),
  openRepairs: z.array(instrumentOpenRepairSchema),
});
export type InstrumentDetail = z.infer<typeof instrumentDetailSchema>;

/** What a form sends to add an instrument to the fleet. */
export const instrumentInputSchema = z.strictObject({
  assetTag: z
    .string()
    .trim()
    .toUpperCase()
    .regex(/^[A-Z0-9][A-Z0-9-]{1,31}$/, 'An asset tag is 2 to 32 letters, digits or dashes.'),
  instrumentId: z
    .string()
    .refine((id) => instrumentIds.includes(id), 'Pick one of the instruments the district knows.'),
  maker: plainText().max(120).default(''),
  model: plainText().max(120).default(''),
  serial: plainText().max(120).default(''),
  purchasedOn: dateText.nullable().default(null),
  purchaseCostCents: z.number().int().min(0).max(100_000_000).nullable().default(null),
  fundingSource: plainText().max(120).default(''),
  condition: z.enum(instrumentConditions).default('good'),
  homeSchoolId: recordId(),
  location: plainText().max(200).default(''),
  notes: plainText().max(4000).default(''),
});
export type InstrumentInput = z.infer<typeof instrumentInputSchema>;

/** What a PATCH sends: any fields, a hand-set status, and the version the editor started from. */
export const instrumentPatchSchema = patchSchemaOf({
  ...instrumentInputSchema.shape,
  status: z.enum(manualInstrumentStatuses),
});
export type InstrumentPatch = z.infer<typeof instrumentPatchSchema>;

/** The field filters of `GET /api/instruments`, besides q, sort, offset and limit. */
export const instrumentFiltersSchema = z.strictObject({
  status: z.enum(instrumentStatuses).optional(),
  condition: z.enum(instrumentConditions).optional(),
  instrumentId: z.string().optional(),
  family: z.string().optional(),
  homeSchoolId: idParameter.optional(),
});

/** The fields `GET /api/instruments` sorts on. */
export const instrumentSortFields = [
  'assetTag',
  'instrumentId',
  'maker',
  'model',
  'condition',
  'status',
  'purchasedOn',
  'purchaseCostCents',
  'homeSchoolCode',
  'updatedAt',
] as const;

/** What `POST /api/instruments/:id/cleaned` may send. */
export const cleanedInputSchema = z.strictObject({ note: plainText().max(500).default('') });

/** The columns of a fleet CSV, in the order a template lists them. */
export const fleetCsvColumns = [
  'asset_tag',
  'instrument',
  'maker',
  'model',
  'serial',
  'purchased_on',
  'purchase_cost',
  'funding_source',
  'condition',
  'home_school_code',
] as const;

/** The answer of `POST /api/instruments/import`. */
export const fleetImportResultSchema = z.object({
  rows: z.number().int(),
  created: z.number().int(),
  updated: z.number().int(),
  unchanged: z.number().int(),
  errors: z.array(z.object({ line: z.number().int(), column: z.string(), message: z.string() })),
  committed: z.boolean(),
});
export type FleetImportResult = z.infer<typeof fleetImportResultSchema>;
