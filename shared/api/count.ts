import * as z from 'zod';
import { homeSchoolFields, schoolRefFields } from './fields';
import { idParameter, plainText, recordId } from './input-rules';

/** An inventory count is open while scanning and closed when reconciled. */
export const countStates = ['open', 'closed'] as const;

/**
 * What one scan found: the instrument at its home school, one whose home is elsewhere, a tag the
 * fleet does not know, or a tag already scanned in this count.
 */
export const scanOutcomes = ['found', 'found-elsewhere', 'unknown', 'duplicate'] as const;
export type ScanOutcome = (typeof scanOutcomes)[number];

/** One annual (or spot) count at a school. */
export const countSchema = z.object({
  id: z.number().int(),
  ...schoolRefFields,
  startedBy: z.number().int().nullable(),
  startedByName: z.string().nullable(),
  startedAt: z.string(),
  closedAt: z.string().nullable(),
  state: z.enum(countStates),
  scanCount: z.number().int(),
});
export type Count = z.infer<typeof countSchema>;

/** One scanned (or typed) asset tag. */
export const countScanSchema = z.object({
  id: z.number().int(),
  assetTag: z.string(),
  instrumentId: z.number().int().nullable(),
  outcome: z.enum(scanOutcomes),
  scannedAt: z.string(),
});
export type CountScan = z.infer<typeof countScanSchema>;

/** An instrument as a reconciliation lists it. */
export const countedInstrumentSchema = z.object({
  id: z.number().int(),
  assetTag: z.string(),
  instrumentName: z.string(),
  status: z.string(),
  ...homeSchoolFields,
});

/** A count with its scans and how they reconcile with the fleet's records. */
export const countDetailSchema = countSchema.extend({
  scans: z.array(countScanSchema),
  reconciliation: z.object({
    /** Expected at this school and scanned here. */
    found: z.array(countedInstrumentSchema),
    /** Scanned here, but their home school is another. */
    foundElsewhere: z.array(countedInstrumentSchema),
    /** Expected at this school (not on loan, retired or already missing) and not scanned. */
    notFound: z.array(countedInstrumentSchema),
    /** Tags scanned that the fleet does not know, as typed. */
    unknownTags: z.array(z.string()),
    /** Expected here but out on loan, so not expected on the shelf. */
    onLoan: z.array(countedInstrumentSchema),
    /** Scanned on the shelf while an open repair ticket says it was sent to the vendor. */
    atVendor: z.array(
      countedInstrumentSchema.extend({
        repairId: z.number().int(),
        vendor: z.string().nullable(),
        sentOn: z.string().nullable(),
      }),
    ),
  }),
});
export type CountDetail = z.infer<typeof countDetailSchema>;

export const countStartSchema = z.strictObject({ schoolId: recordId() });
export const countScanInputSchema = z.strictObject({ assetTag: plainText().min(1).max(64) });
export const countCloseSchema = z.strictObject({ confirmMissing: z.boolean().default(false) });

/** The field filters of `GET /api/counts`. */
export const countFiltersSchema = z.strictObject({
  schoolId: idParameter.optional(),
  state: z.enum(countStates).optional(),
});
