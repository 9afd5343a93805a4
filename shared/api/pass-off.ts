import * as z from 'zod';
import { studentLinkFields } from './fields';
import { calendarDate, idParameter, plainText, recordId, versionNumber } from './input-rules';
import { requirementCodePattern } from './ladder';

/** The most pass-offs one `POST /api/pass-offs` may carry (one entry grid's worth). */
export const passOffBatchLimit = 200;

/** The largest recording a pass-off may carry, in bytes (10 MB). */
export const recordingSizeLimit = 10 * 1024 * 1024;

/** The audio types a recording may be, recognised by the file's own bytes. */
export const recordingContentTypes = [
  'audio/webm',
  'audio/ogg',
  'audio/mpeg',
  'audio/wav',
  'audio/mp4',
] as const;
export type RecordingContentType = (typeof recordingContentTypes)[number];

/** The fields `GET /api/pass-offs?sort=<field>:asc|desc` accepts. */
export const passOffSortFields = [
  'heardOn',
  'tempo',
  'requirementCode',
  'studentName',
  'createdAt',
] as const;

/** Why a pass-off no longer counts under the active ladder, when it does not. */
export const passOffStandings = [
  /** It counts towards the requirement of the same code in the active ladder. */
  'counts',
  /** Not passed ("not yet"): it never counted. */
  'not-yet',
  /** Passed, but slower than the active ladder's tempo for that requirement. */
  'below-tempo',
  /** Passed, but the active ladder has no requirement with that code any more. */
  'requirement-gone',
] as const;
export type PassOffStanding = (typeof passOffStandings)[number];

/** A recording attached to a pass-off (the file itself is `GET /api/pass-offs/:id/recording`). */
export const recordingSchema = z.object({
  id: z.number().int(),
  originalName: z.string(),
  contentType: z.enum(recordingContentTypes),
  size: z.number().int(),
  sha256: z.string(),
  /** ISO 8601 time. */
  createdAt: z.string(),
});
export type Recording = z.infer<typeof recordingSchema>;

/** One pass-off as the list and the detail answer it. */
export const passOffSchema = z.object({
  id: z.number().int(),
  ...studentLinkFields,
  schoolId: z.number().int(),
  requirementCode: z.string(),
  /** The ladder version the pass-off was heard under. */
  ladderVersionId: z.number().int(),
  /** ISO date, YYYY-MM-DD. */
  heardOn: z.string(),
  /** Quarter note = tempo, as played. */
  tempo: z.number().int(),
  passed: z.boolean(),
  heardById: z.number().int().nullable(),
  heardByName: z.string().nullable(),
  note: z.string(),
  recording: recordingSchema.nullable(),
  clientKey: z.string().nullable(),
  /** How the pass-off stands under the active ladder. */
  standing: z.enum(passOffStandings),
  /** Why it no longer counts, in words, or null when it counts or is a "not yet". */
  standingNote: z.string().nullable(),
  version: z.number().int(),
  /** When it was entered on the director's device (ISO 8601), or recorded when sent without. */
  enteredAt: z.string(),
  /** ISO 8601 times. */
  createdAt: z.string(),
  updatedAt: z.string(),
});
export type PassOff = z.infer<typeof passOffSchema>;

/** One pass-off as the entry grid sends it. */
export const passOffInputSchema = z.strictObject({
  studentId: recordId('Choose the student.'),
  requirementCode: z
    .string()
    .trim()
    .regex(requirementCodePattern, 'Choose a requirement of the ladder.'),
  heardOn: calendarDate('The date heard is YYYY-MM-DD.'),
  tempo: z
    .number({ message: 'Tempo is a whole number of quarter notes a minute.' })
    .int('Tempo is a whole number of quarter notes a minute.')
    .min(20, 'Tempo is at least 20.')
    .max(300, 'Tempo is at most 300.'),
  passed: z.boolean({ message: 'Say whether it passed.' }),
  note: plainText().max(1000).default(''),
  /**
   * A UUID the client makes once per pass-off; sending the same one again (a retried request)
   * answers the pass-off already recorded instead of recording it twice.
   */
  clientKey: z.uuid('The client key is a UUID.').optional(),
  /**
   * The ensemble the pass-off was heard in, when entered from an ensemble's grid: the server
   * then refuses it (400, field `passOffs.N.ensembleId`) if the student no longer has a seat in
   * that ensemble this year, say an entry that waited offline while the roster moved.
   */
  ensembleId: recordId('Choose the ensemble.').optional(),
  /**
   * When it was entered on the device (ISO 8601 with an offset). Of two entries for one cell
   * made offline on two devices, the later entered is the one shown; a time ahead of the
   * server's clock is taken as the time it arrived.
   */
  enteredAt: z.iso
    .datetime({ offset: true, message: 'The time entered is an ISO 8601 time.' })
    .optional(),
});
export type PassOffInput = z.infer<typeof passOffInputSchema>;

/** `POST /api/pass-offs`: one pass-off, or a batch of up to 200 as `{ passOffs: [...] }`. */
export const passOffBatchSchema = z.strictObject({
  passOffs: z
    .array(passOffInputSchema)
    .min(1, 'Send at least one pass-off.')
    .max(passOffBatchLimit, `Send at most ${passOffBatchLimit} pass-offs at once.`),
});
export type PassOffBatch = z.infer<typeof passOffBatchSchema>;

/** What a batch answers: every pass-off in the order sent, and how many were new. */
export const passOffBatchResultSchema = z.object({
  rows: z.array(passOffSchema),
  created: z.number().int(),
  /** Pass-offs whose client key had been recorded already (a retried request). */
  repeated: z.number().int(),
});
export type PassOffBatchResult = z.infer<typeof passOffBatchResultSchema>;

/** `PATCH /api/pass-offs/:id`: any of the heard fields, plus the version started from. */
export const passOffPatchSchema = passOffInputSchema
  .pick({ heardOn: true, tempo: true, passed: true, note: true })
  .partial()
  .extend({ version: versionNumber });
export type PassOffPatch = z.infer<typeof passOffPatchSchema>;

const booleanQuery = z.preprocess(
  (value) => (value === 'true' ? true : value === 'false' ? false : value),
  z.boolean({ message: 'Use true or false.' }),
);

/** The field filters of `GET /api/pass-offs` (besides q, sort, offset, limit). */
export const passOffFiltersSchema = z.strictObject({
  studentId: idParameter.optional(),
  ensembleId: idParameter.optional(),
  schoolId: idParameter.optional(),
  requirementCode: plainText().max(60).optional(),
  from: calendarDate('From is YYYY-MM-DD.').optional(),
  to: calendarDate('To is YYYY-MM-DD.').optional(),
  passed: booleanQuery.optional(),
});
export type PassOffFilters = z.infer<typeof passOffFiltersSchema>;
