import * as z from 'zod';
import { plainText } from './input-rules';
import { rosterFields } from '../roster/roster-columns';

/** The most bytes one roster upload may have. */
export const largestRosterUpload = 20 * 1024 * 1024;

/** How many rows a preview shows, and how many entries each change list holds at most. */
export const previewRowLimit = 500;
export const planListLimit = 1000;

/** One problem of an upload: the file's line (0 = the file as a whole), its column, the words. */
export const rowErrorSchema = z.object({
  line: z.number().int(),
  column: z.string(),
  message: z.string(),
});
export type ImportRowError = z.infer<typeof rowErrorSchema>;

const rosterFieldSchema = z.enum(rosterFields);

/** Which file header feeds each roster field. */
export const columnMappingSchema = z.partialRecord(rosterFieldSchema, plainText().max(300));

/** A mapping problem: a required field with no column, or a column chosen twice. */
export const mappingProblemSchema = z.object({ field: rosterFieldSchema, message: z.string() });

/** One row of the preview as the file has it, each roster field's cell, and its errors. */
export const previewRowSchema = z.object({
  line: z.number().int(),
  cells: z.partialRecord(rosterFieldSchema, z.string()),
  errors: z.array(rowErrorSchema),
});
export type PreviewRow = z.infer<typeof previewRowSchema>;

/** A student an import creates or withdraws. */
export const plannedStudentSchema = z.object({
  studentId: z.string(),
  firstName: z.string(),
  lastName: z.string(),
  schoolCode: z.string(),
  grade: z.number().int(),
});
export type PlannedStudent = z.infer<typeof plannedStudentSchema>;

/** One changed field of an existing student: a roster field, or `status` when one comes back. */
export const fieldChangeSchema = z.object({
  field: z.union([rosterFieldSchema, z.literal('status')]),
  /** The ensemble a seat change is about (`ensemble` and `instrument` changes). */
  ensemble: z.string().optional(),
  before: z.string().nullable(),
  after: z.string().nullable(),
});
export type FieldChange = z.infer<typeof fieldChangeSchema>;

/** An existing student an import changes, with each change. */
export const plannedUpdateSchema = plannedStudentSchema.extend({
  changes: z.array(fieldChangeSchema),
});
export type PlannedUpdate = z.infer<typeof plannedUpdateSchema>;

/** An ensemble the file names that its school does not have yet. */
export const plannedEnsembleSchema = z.object({
  schoolCode: z.string(),
  name: z.string(),
  kind: z.string(),
});
export type PlannedEnsemble = z.infer<typeof plannedEnsembleSchema>;

/**
 * What an import would do, counted by roster row (created + updated + unchanged rows plus the
 * rows with errors make every row of the file); withdrawn counts students the file leaves out.
 * The lists are by student and hold at most {@link planListLimit} entries each.
 */
export const planSummarySchema = z.object({
  rows: z.number().int(),
  validRows: z.number().int(),
  created: z.number().int(),
  updated: z.number().int(),
  unchanged: z.number().int(),
  withdrawn: z.number().int(),
  createdStudents: z.array(plannedStudentSchema),
  createdStudentTotal: z.number().int(),
  updatedStudents: z.array(plannedUpdateSchema),
  updatedStudentTotal: z.number().int(),
  withdrawnStudents: z.array(plannedStudentSchema),
  withdrawnStudentTotal: z.number().int(),
  newEnsembles: z.array(plannedEnsembleSchema),
  /** The schools the file's rows are at; only their students can be withdrawn. */
  schoolCodes: z.array(z.string()),
});
export type PlanSummary = z.infer<typeof planSummarySchema>;

/** The answer of `POST /api/imports/preview`. */
export const importPreviewSchema = z.object({
  importToken: z.string(),
  fileName: z.string(),
  source: z.enum(['csv', 'oneroster']),
  headers: z.array(z.string()),
  mapping: columnMappingSchema,
  guessedMapping: columnMappingSchema,
  mappingProblems: z.array(mappingProblemSchema),
  rows: z.array(previewRowSchema),
  errors: z.array(rowErrorSchema),
  totalRows: z.number().int(),
  plan: planSummarySchema,
  /**
   * A OneRoster bundle: its version, whether it is a delta (changes only), how many records it
   * marks `tobedeleted` (with the enrolments pointing at them) and so leaves out, and the orgs
   * that matched no school of the district, for the coordinator to map.
   */
  oneRoster: z
    .object({
      version: z.enum(['1.1', '1.2']),
      delta: z.boolean(),
      skipped: z.number().int(),
      unmappedOrgs: z.array(
        z.object({
          sourcedId: z.string(),
          name: z.string(),
          identifier: z.string(),
          type: z.string(),
          line: z.number().int(),
        }),
      ),
    })
    .optional(),
});
export type ImportPreview = z.infer<typeof importPreviewSchema>;

const flag = z
  .union([z.boolean(), z.enum(['true', 'false', '1', '0', 'on', 'off', ''])])
  .optional()
  .transform((value) => value === true || value === 'true' || value === '1' || value === 'on');

/** The form fields beside the file in a preview upload (multipart, so text). */
export const previewFieldsSchema = z.strictObject({
  mapping: z
    .string()
    .max(20_000)
    .optional()
    .transform((text, context) => {
      if (text === undefined || text.trim() === '') return undefined;
      try {
        const parsed = columnMappingSchema.safeParse(JSON.parse(text));
        if (parsed.success) return parsed.data;
      } catch {
        // Reported below.
      }
      context.addIssue({
        code: 'custom',
        message: 'The mapping must be a JSON object of roster field to column.',
      });
      return z.NEVER;
    }),
  withdrawMissing: flag,
  /** Instead of a file: the token of an upload kept from an earlier preview. */
  importToken: z
    .string()
    .regex(/^[A-Za-z0-9_-]{16,64}$/, 'The import token is not one this server gave.')
    .optional(),
});

/** What `POST /api/imports/commit` takes. */
export const commitRequestSchema = z.strictObject({
  importToken: z
    .string()
    .regex(/^[A-Za-z0-9_-]{16,64}$/, 'The import token is not one this server gave.'),
  mapping: columnMappingSchema.optional(),
  withdrawMissing: z.boolean().default(false),
  skipInvalid: z.boolean().default(false),
});
export type CommitRequest = z.input<typeof commitRequestSchema>;

/** What an import did: the same object `tutti import --json` prints. */
export const importResultSchema = z.object({
  rows: z.number().int(),
  created: z.number().int(),
  updated: z.number().int(),
  unchanged: z.number().int(),
  withdrawn: z.number().int(),
  errors: z.array(rowErrorSchema),
  committed: z.boolean(),
});
export type ImportResult = z.infer<typeof importResultSchema>;

/** One past import in the history list. */
export const importHistoryEntrySchema = z.object({
  id: z.number().int(),
  fileName: z.string(),
  source: z.string(),
  via: z.enum(['wizard', 'cli', 'api']),
  committed: z.boolean(),
  rows: z.number().int(),
  created: z.number().int(),
  updated: z.number().int(),
  unchanged: z.number().int(),
  withdrawn: z.number().int(),
  errorCount: z.number().int(),
  /** Who ran it; null for `tutti import` on the server's machine. */
  userName: z.string().nullable(),
  createdAt: z.string(),
  /** When the import was undone; null while it stands. */
  undoneAt: z.string().nullable(),
});
export type ImportHistoryEntry = z.infer<typeof importHistoryEntrySchema>;

/** One past import with its errors (at most {@link planListLimit}; the CSV report has all). */
export const importDetailSchema = importHistoryEntrySchema.extend({
  errors: z.array(rowErrorSchema),
});
export type ImportDetail = z.infer<typeof importDetailSchema>;

/** A saved column mapping, named for the system whose export it reads. */
export const importPresetSchema = z.object({
  id: z.number().int(),
  name: z.string(),
  mapping: columnMappingSchema,
  updatedAt: z.string(),
});
export type ImportPreset = z.infer<typeof importPresetSchema>;

/** What saving a preset takes; a preset of the same name is replaced. */
export const importPresetInputSchema = z.strictObject({
  name: plainText().min(1, 'Give the preset a name, e.g. the system the file comes from.').max(80),
  mapping: columnMappingSchema,
});
export type ImportPresetInput = z.infer<typeof importPresetInputSchema>;

/** How many days after it ran an import can still be undone. */
export const importUndoDays = 7;

/** What undoing an import would do, and what stops it (nothing is undone while any blocks it). */
export const importUndoPreviewSchema = z.object({
  importId: z.number().int(),
  fileName: z.string(),
  createdAt: z.string(),
  /** The last moment it can be undone. */
  undoableUntil: z.string(),
  /** Students the import created, removed with their seats. */
  studentsRemoved: z.number().int(),
  /** Students whose fields (name, grade, school, guardian, status) it changed, set back. */
  studentsRestored: z.number().int(),
  /** Students it marked withdrawn, made active again. */
  withdrawalsReversed: z.number().int(),
  /** Seats of existing students it added, changed or ended, put back as they were. */
  seatsRestored: z.number().int(),
  /** Ensembles it created, removed when no one else sits in them. */
  ensemblesRemoved: z.number().int(),
  /** Why it cannot be undone, one sentence each; empty when it can. */
  blockers: z.array(z.string()),
  canUndo: z.boolean(),
});
export type ImportUndoPreview = z.infer<typeof importUndoPreviewSchema>;

/** The answer of an undo: what it did. */
export const importUndoResultSchema = importUndoPreviewSchema.extend({
  undoneAt: z.string(),
});
export type ImportUndoResult = z.infer<typeof importUndoResultSchema>;
