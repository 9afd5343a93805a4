import * as z from 'zod';
import { studentLinkFields } from './fields';
import { requirementCodePattern } from './ladder';
import { recordingContentTypes } from './pass-off';

/** The largest take a student may keep, in bytes (10 minutes of compressed audio fits). */
export const takeSizeLimit = 10 * 1024 * 1024;

const noteName = z
  .string()
  .regex(/^[A-G](#{1,2}|b{1,2})?-?\d$/, 'A note with its octave, e.g. F#4.');

/** What the listening aid heard in a take (`analyseTake` in shared/listening), as sent and kept. */
export const takeAnalysisSchema = z.object({
  tempo: z.number().positive().max(1000).nullable(),
  notes: z
    .array(
      z.object({
        expected: noteName,
        heard: noteName.nullable(),
        centsOff: z.number().min(-10_000).max(10_000).nullable(),
        onset: z.number().min(0).max(600).nullable(),
        verdict: z.enum(['ok', 'out-of-tune', 'wrong-note', 'missed']),
      }),
    )
    .min(1)
    .max(500),
  pitchAccuracy: z.number().min(0).max(1),
  extraNotes: z.number().int().min(0).max(10_000),
});

/** The form fields sent with a take's recording (`POST /api/takes`, multipart). */
export const takeInputSchema = z.object({
  requirementCode: z
    .string()
    .trim()
    .regex(requirementCodePattern, 'Name the requirement by its code.'),
  tempoAsked: z.coerce.number().int().min(20).max(400),
  analysis: z
    .string()
    .transform((text, context) => {
      try {
        return JSON.parse(text) as unknown;
      } catch {
        context.addIssue({ code: 'custom', message: 'The analysis is not JSON.' });
        return z.NEVER;
      }
    })
    .pipe(takeAnalysisSchema),
});

/** A take as the API answers it. */
export const takeSchema = z.object({
  id: z.number().int(),
  ...studentLinkFields,
  requirementCode: z.string(),
  tempoAsked: z.number().int(),
  contentType: z.enum(recordingContentTypes),
  size: z.number().int(),
  analysis: takeAnalysisSchema,
  status: z.enum(['kept', 'sent']),
  sentAt: z.string().nullable(),
  createdAt: z.string(),
  /** Whether a director (or the coordinator) recorded it while hearing the student. */
  heardLive: z.boolean(),
});
export type Take = z.infer<typeof takeSchema>;

/** The form fields of a director's own take of a student (`POST /api/takes/heard`, multipart). */
export const heardTakeInputSchema = takeInputSchema.extend({
  studentId: z.coerce.number().int().positive().max(2_147_483_647),
});

/** How long takes are kept: until the end of the school year they were made in, or some days. */
export const takeRetentionSchema = z.union([
  z.object({ keep: z.literal('school-year') }),
  z.object({ keep: z.literal('days'), days: z.number().int().min(1).max(3650) }),
]);
export type TakeRetention = z.infer<typeof takeRetentionSchema>;

/** The retention when the district has set none. */
export const defaultTakeRetention: TakeRetention = { keep: 'school-year' };
