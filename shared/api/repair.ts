import * as z from 'zod';
import { homeSchoolFields } from './fields';
import { calendarDate, idParameter, plainText, recordId, patchSchemaOf } from './input-rules';

/** A repair ticket's path: open, sent to a vendor, back, closed. */
export const repairStatuses = ['open', 'sent', 'returned', 'closed'] as const;
export type RepairStatus = (typeof repairStatuses)[number];

const dateText = calendarDate('Write the date as YYYY-MM-DD.');

/** One repair ticket. `vendor` is null for in-house work. */
export const repairSchema = z.object({
  id: z.number().int(),
  instrumentId: z.number().int(),
  assetTag: z.string(),
  instrumentName: z.string(),
  ...homeSchoolFields,
  problem: z.string(),
  reportedBy: z.number().int().nullable(),
  reportedByName: z.string().nullable(),
  vendor: z.string().nullable(),
  inHouse: z.boolean(),
  estimateCents: z.number().int().nullable(),
  finalCostCents: z.number().int().nullable(),
  sentOn: z.string().nullable(),
  returnedOn: z.string().nullable(),
  status: z.enum(repairStatuses),
  notes: z.string(),
  createdAt: z.string(),
  version: z.number().int(),
});
export type Repair = z.infer<typeof repairSchema>;

/** A repair's cost in cents, up to a million dollars; null when not known yet. */
const costCents = z.number().int().min(0).max(100_000_000).nullable();

/** What a technician sends to open a ticket. */
export const repairInputSchema = z.strictObject({
  instrumentId: recordId(),
  problem: plainText().min(3).max(2000),
  vendor: plainText().max(120).nullable().default(null),
  inHouse: z.boolean().default(true),
  estimateCents: costCents.default(null),
  notes: plainText().max(4000).default(''),
});
export type RepairInput = z.infer<typeof repairInputSchema>;

/** What a PATCH sends: any fields, plus the version the editor started from. */
export const repairPatchSchema = patchSchemaOf({
  ...repairInputSchema.omit({ instrumentId: true }).shape,
  finalCostCents: costCents,
  sentOn: dateText.nullable(),
  returnedOn: dateText.nullable(),
  status: z.enum(repairStatuses),
});
export type RepairPatch = z.infer<typeof repairPatchSchema>;

/** The field filters of `GET /api/repairs`. */
export const repairFiltersSchema = z.strictObject({
  status: z.enum(repairStatuses).optional(),
  open: z.enum(['true', 'false']).optional(),
  instrumentId: idParameter.optional(),
  homeSchoolId: idParameter.optional(),
});

/** The fields `GET /api/repairs` sorts on. */
export const repairSortFields = [
  'createdAt',
  'status',
  'assetTag',
  'sentOn',
  'returnedOn',
  'estimateCents',
  'finalCostCents',
] as const;

/** The caution every repair screen shows. */
export const repairCaution =
  'Repairs beyond simple care (oiling valves, greasing slides, replacing strings) go to a qualified repair technician.';
