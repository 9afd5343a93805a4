import * as z from 'zod';
import { calendarDate, plainText, versionNumber } from './input-rules';
import { articulations, checkKey, instrumentFamilies, modes, patternIds } from '../music/index';

/** Where a ladder version is in its life: edited, in force (or once in force), or retired. */
export const ladderVersionStatuses = ['draft', 'published', 'archived'] as const;
export type LadderVersionStatus = (typeof ladderVersionStatuses)[number];

/** The slowest and fastest quarter-note tempo a requirement may ask for. */
export const requirementTempoRange = { lowest: 30, highest: 240 } as const;

/** A requirement's stable code: lower-case letters, digits and dashes, e.g. `r1-bb-major`. */
export const requirementCodePattern = /^[a-z0-9][a-z0-9-]{0,59}$/;

const tonicSchema = z
  .string()
  .trim()
  .regex(/^[A-G](##|#|bb|b)?$/, 'A tonic is a letter A–G with an optional #, ##, b or bb.');

/** A requirement as the API answers and a draft edit sends it (concert pitch). */
export const requirementSchema = z
  .object({
    /** The stable code pass-offs name across ladder versions. */
    code: z
      .string()
      .trim()
      .regex(
        requirementCodePattern,
        'A code is lower-case letters, digits and dashes, e.g. r1-bb-major.',
      ),
    tonic: tonicSchema,
    mode: z.enum(modes, { message: `Mode is one of ${modes.join(', ')}.` }),
    pattern: z.enum(patternIds, {
      message: `Pattern is one of ${patternIds.join(', ')}.`,
    }),
    tempo: z
      .number({ message: 'Tempo is a whole number of quarter notes a minute.' })
      .int('Tempo is a whole number of quarter notes a minute.')
      .min(requirementTempoRange.lowest, `Tempo is at least ${requirementTempoRange.lowest}.`)
      .max(requirementTempoRange.highest, `Tempo is at most ${requirementTempoRange.highest}.`),
    articulation: z.enum(articulations, {
      message: `Articulation is one of ${articulations.join(', ')}.`,
    }),
    octaves: z.union([z.literal(1), z.literal(2)], { message: 'Octaves is 1 or 2.' }),
    optional: z.boolean().default(false),
    /** The instrument families it applies to; null means every family. */
    families: z
      .array(
        z.enum(instrumentFamilies, {
          message: `A family is one of ${instrumentFamilies.join(', ')}.`,
        }),
      )
      .min(1, 'List at least one family, or leave families empty for every family.')
      .nullable()
      .default(null),
  })
  .superRefine((requirement, context) => {
    try {
      checkKey({ tonic: requirement.tonic, mode: requirement.mode });
    } catch (error) {
      context.addIssue({ code: 'custom', path: ['tonic'], message: (error as Error).message });
    }
  });
export type LadderRequirement = z.infer<typeof requirementSchema>;

/** One rung with its requirements, in ladder order. */
export const rungSchema = z.object({
  number: z.number().int().min(1).max(50),
  title: plainText().min(1, 'Give the rung a title.').max(120),
  requirements: z.array(requirementSchema).max(60),
});
export type LadderRung = z.infer<typeof rungSchema>;

/** The rung a grade should have reached by a date (e.g. mid-year and year-end). */
export const benchmarkSchema = z.object({
  /** 0 is kindergarten. */
  grade: z.number().int().min(0).max(12),
  rung: z.number().int().min(0).max(50),
  /** ISO date, YYYY-MM-DD. */
  byDate: calendarDate('A benchmark date is YYYY-MM-DD.'),
});
export type LadderBenchmark = z.infer<typeof benchmarkSchema>;

/** A ladder version's heading, as the version list answers it. */
export const ladderVersionSummarySchema = z.object({
  id: z.number().int(),
  name: z.string(),
  status: z.enum(ladderVersionStatuses),
  /** Whether attainment is computed against this version (the published one in force). */
  active: z.boolean(),
  /** ISO 8601 times. */
  createdAt: z.string(),
  publishedAt: z.string().nullable(),
  createdByName: z.string().nullable(),
  rungCount: z.number().int(),
  requirementCount: z.number().int(),
  version: z.number().int(),
});
export type LadderVersionSummary = z.infer<typeof ladderVersionSummarySchema>;

/** `GET /api/ladder` and `GET /api/ladder/versions/:id`: a version with everything in it. */
export const ladderSchema = ladderVersionSummarySchema.extend({
  rungs: z.array(rungSchema),
  benchmarks: z.array(benchmarkSchema),
});
export type Ladder = z.infer<typeof ladderSchema>;

/** `POST /api/ladder/versions`: a new draft, copied from the active version. */
export const ladderDraftInputSchema = z.strictObject({
  name: plainText().min(1).max(120).optional(),
  /**
   * Start from the starter ladder (seven rungs, long tones at ♩ = 60 up to all twelve major
   * scales) instead of the version in force; benchmarks are left for the district to set.
   */
  starter: z.boolean().optional(),
});
export type LadderDraftInput = z.infer<typeof ladderDraftInputSchema>;

/**
 * What makes two requirements of one rung the same thing to play (tempo and articulation aside).
 * An optional requirement beside a required one of the same shape is a stretch goal (the same
 * scale faster), not a repeat, so whether it is optional counts too.
 */
function requirementShape(requirement: LadderRequirement): string {
  const families = requirement.families ? [...requirement.families].sort().join('+') : '*';
  return [
    requirement.tonic,
    requirement.mode,
    requirement.pattern,
    requirement.octaves,
    families,
    requirement.optional ? 'optional' : 'required',
  ].join('|');
}

/** The mark drafts carry in their name, which a published version never keeps. */
export const draftNameMark = /\(draft\)/i;

/**
 * `POST /api/ladder/versions/:id/publish` and `/restore`: the impact the coordinator was shown
 * (its `token`), and for a draft the name it takes when it goes live.
 */
export const ladderPublishInputSchema = z.object({
  impactToken: z.string({
    message: 'Look at what publishing changes first: send the impactToken of its impact.',
  }),
  name: z
    .string()
    .trim()
    .min(1, 'Give the version a name.')
    .max(120)
    .refine((name) => !draftNameMark.test(name), {
      message: 'A published version takes a name of its own, without “(draft)”.',
    })
    .optional(),
});
export type LadderPublishInput = z.infer<typeof ladderPublishInputSchema>;

/** The students of one school and grade whose rung a version would change, and how. */
export const ladderImpactGroupSchema = z.object({
  schoolId: z.number().int(),
  schoolName: z.string(),
  grade: z.number().int(),
  up: z.number().int(),
  down: z.number().int(),
  same: z.number().int(),
});
export type LadderImpactGroup = z.infer<typeof ladderImpactGroupSchema>;

/** The share of active students at or above their grade's benchmark today, before and after. */
export const benchmarkShareSchema = z.object({
  /** Students with a benchmark for their grade. */
  counted: z.number().int(),
  atOrAbove: z.number().int(),
  /** 0..1, null when no student has a benchmark. */
  share: z.number().nullable(),
});

/**
 * `GET /api/ladder/versions/:id/impact`: what putting a version in force would do to every
 * active student's rung, against the version in force now.
 */
export const ladderImpactSchema = z.object({
  versionId: z.number().int(),
  versionName: z.string(),
  activeVersionId: z.number().int().nullable(),
  activeVersionName: z.string().nullable(),
  up: z.number().int(),
  down: z.number().int(),
  same: z.number().int(),
  groups: z.array(ladderImpactGroupSchema),
  benchmark: z.object({ before: benchmarkShareSchema, after: benchmarkShareSchema }),
  /** Send it back with publish or restore: it says this impact is the one that was seen. */
  token: z.string(),
});
export type LadderImpact = z.infer<typeof ladderImpactSchema>;

/** The ways a version moves a student's rung. */
export const rungMoves = ['up', 'down', 'same'] as const;

/** `GET /api/ladder/versions/:id/impact/students`: the names behind one figure of the impact. */
export const ladderImpactStudentSchema = z.object({
  studentId: z.number().int(),
  studentNumber: z.string(),
  name: z.string(),
  schoolId: z.number().int(),
  grade: z.number().int(),
  rungBefore: z.number().int(),
  rungAfter: z.number().int(),
});
export type LadderImpactStudent = z.infer<typeof ladderImpactStudentSchema>;

/** The filters of the impact's drill-down. */
export const ladderImpactStudentsQuerySchema = z.object({
  schoolId: z.coerce.number().int().optional(),
  grade: z.coerce.number().int().min(0).max(12).optional(),
  move: z.enum(rungMoves, { message: `move is one of ${rungMoves.join(', ')}.` }),
});

/**
 * `PATCH /api/ladder/versions/:id` (drafts only): the name, and the rungs (numbered 1, 2, 3…
 * with codes unique across the version) and benchmarks, each replacing what the draft held;
 * plus the version the editor started from.
 */
export const ladderPatchSchema = z
  .strictObject({
    name: plainText().min(1).max(120).optional(),
    rungs: z.array(rungSchema).max(50).optional(),
    benchmarks: z.array(benchmarkSchema).max(400).optional(),
    version: versionNumber,
  })
  .superRefine((patch, context) => {
    const seen = new Set<string>();
    patch.rungs?.forEach((rung, index) => {
      if (rung.number !== index + 1) {
        context.addIssue({
          code: 'custom',
          path: ['rungs', index, 'number'],
          message: `Rungs are numbered 1, 2, 3… in order; this one should be ${index + 1}.`,
        });
      }
      const sameInRung = new Map<string, number>();
      rung.requirements.forEach((requirement, position) => {
        const shape = requirementShape(requirement);
        const twin = sameInRung.get(shape);
        if (twin !== undefined) {
          context.addIssue({
            code: 'custom',
            path: ['rungs', index, 'requirements', position, 'tonic'],
            message: `Rung ${rung.number} already asks for this: requirement ${twin + 1} has the same key, mode, pattern, octaves and families. Change one of them or remove this one.`,
          });
        } else sameInRung.set(shape, position);
        if (seen.has(requirement.code)) {
          context.addIssue({
            code: 'custom',
            path: ['rungs', index, 'requirements', position, 'code'],
            message: `The code ${requirement.code} is used twice; each requirement needs its own.`,
          });
        }
        seen.add(requirement.code);
      });
    });
    const dates = new Set<string>();
    patch.benchmarks?.forEach((benchmark, index) => {
      const key = `${benchmark.grade}@${benchmark.byDate}`;
      if (dates.has(key)) {
        context.addIssue({
          code: 'custom',
          path: ['benchmarks', index],
          message: `Grade ${benchmark.grade} already has a benchmark on ${benchmark.byDate}.`,
        });
      }
      dates.add(key);
      if (patch.rungs && benchmark.rung > patch.rungs.length) {
        context.addIssue({
          code: 'custom',
          path: ['benchmarks', index, 'rung'],
          message: `The ladder has ${patch.rungs.length} rungs; a benchmark cannot ask for rung ${benchmark.rung}.`,
        });
      }
    });
  });
export type LadderPatch = z.infer<typeof ladderPatchSchema>;
