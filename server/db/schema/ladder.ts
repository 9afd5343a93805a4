import { sql } from 'drizzle-orm';
import {
  boolean,
  index,
  integer,
  pgTable,
  primaryKey,
  smallint,
  text,
  uniqueIndex,
  uuid,
} from 'drizzle-orm/pg-core';
import { identity, created, timestamps, version, moment, day, linkTo } from './columns';
import { actedBy } from './people';
import { students } from './roster';
import { schools } from './schools';

/**
 * One version of the district's scale ladder. Drafts are edited; publishing makes a version the
 * active one, the version every student's rung is computed against.
 */
export const ladderVersions = pgTable(
  'ladder_versions',
  {
    ...identity,
    name: text('name').notNull(),
    status: text('status', { enum: ['draft', 'published', 'archived'] })
      .notNull()
      .default('draft'),
    active: boolean('active').notNull().default(false),
    publishedAt: moment('published_at'),
    createdBy: actedBy('created_by'),
    ...version,
    ...timestamps,
  },
  (table) => [
    uniqueIndex('ladder_versions_one_active')
      .on(table.active)
      .where(sql`active`),
  ],
);

/** A rung of one ladder version, numbered 1, 2, 3… */
export const ladderRungs = pgTable(
  'ladder_rungs',
  {
    ...identity,
    ladderVersionId: linkTo('ladder_version_id', () => ladderVersions.id, 'cascade'),
    number: smallint('number').notNull(),
    title: text('title').notNull(),
  },
  (table) => [uniqueIndex('ladder_rungs_number_unique').on(table.ladderVersionId, table.number)],
);

/** A scale a rung asks for, in concert pitch; `code` stays the same across versions. */
export const ladderRequirements = pgTable(
  'ladder_requirements',
  {
    ...identity,
    ladderVersionId: linkTo('ladder_version_id', () => ladderVersions.id, 'cascade'),
    rungId: linkTo('rung_id', () => ladderRungs.id, 'cascade'),
    position: smallint('position').notNull().default(0),
    code: text('code').notNull(),
    tonic: text('tonic').notNull(),
    mode: text('mode').notNull(),
    pattern: text('pattern').notNull(),
    tempo: smallint('tempo').notNull(),
    articulation: text('articulation').notNull(),
    octaves: smallint('octaves').notNull().default(1),
    optional: boolean('optional').notNull().default(false),
    /** Null: every family. */
    families: text('families').array(),
  },
  (table) => [
    uniqueIndex('ladder_requirements_code_unique').on(table.ladderVersionId, table.code),
    index('ladder_requirements_rung_idx').on(table.rungId, table.position),
  ],
);

/** The rung a grade should have reached by a date, in one ladder version. */
export const ladderBenchmarks = pgTable(
  'ladder_benchmarks',
  {
    ...identity,
    ladderVersionId: linkTo('ladder_version_id', () => ladderVersions.id, 'cascade'),
    grade: smallint('grade').notNull(),
    rung: smallint('rung').notNull(),
    byDate: day('by_date').notNull(),
  },
  (table) => [
    uniqueIndex('ladder_benchmarks_unique').on(table.ladderVersionId, table.grade, table.byDate),
  ],
);

/** One hearing of one requirement by a director: the tempo played and whether it passed. */
export const passOffs = pgTable(
  'pass_offs',
  {
    ...identity,
    studentId: linkTo('student_id', () => students.id, 'cascade'),
    /** The school the student was at when heard (the Overview's weekly counts group by it). */
    schoolId: linkTo('school_id', () => schools.id),
    /** The grade the student was in when heard. */
    grade: smallint('grade').notNull(),
    ladderVersionId: linkTo('ladder_version_id', () => ladderVersions.id),
    requirementId: integer('requirement_id').references(() => ladderRequirements.id, {
      onDelete: 'set null',
    }),
    requirementCode: text('requirement_code').notNull(),
    heardOn: day('heard_on').notNull(),
    tempo: smallint('tempo').notNull(),
    passed: boolean('passed').notNull(),
    heardBy: actedBy('heard_by'),
    note: text('note').notNull().default(''),
    recordingId: integer('recording_id'),
    /** The client's own key for the pass-off, so a retried request never records it twice. */
    clientKey: uuid('client_key'),
    /**
     * When the director entered it on their device (never later than it reached the server): of
     * two entries for one cell that waited offline on two devices, the later entered is the one
     * the grid shows, whichever arrived first. Null for pass-offs sent without it.
     */
    enteredAt: moment('entered_at'),
    ...version,
    ...timestamps,
  },
  (table) => [
    uniqueIndex('pass_offs_client_key_unique').on(table.clientKey),
    index('pass_offs_student_idx').on(table.studentId, table.heardOn),
    index('pass_offs_heard_on_idx').on(table.heardOn),
    index('pass_offs_school_heard_on_idx').on(table.schoolId, table.heardOn),
    index('pass_offs_heard_by_idx').on(table.heardBy, table.heardOn),
    index('pass_offs_requirement_idx').on(table.requirementCode, table.heardOn),
  ],
);

/** An audio recording of a pass-off; the file lives under the data folder by a random name. */
export const passOffRecordings = pgTable(
  'pass_off_recordings',
  {
    ...identity,
    passOffId: linkTo('pass_off_id', () => passOffs.id, 'cascade'),
    storedName: text('stored_name').notNull(),
    originalName: text('original_name').notNull(),
    contentType: text('content_type').notNull(),
    size: integer('size').notNull(),
    sha256: text('sha256').notNull(),
    ...created,
  },
  (table) => [
    index('pass_off_recordings_pass_off_idx').on(table.passOffId),
    uniqueIndex('pass_off_recordings_stored_unique').on(table.storedName),
  ],
);

/**
 * Each student's rung on the active ladder, kept current on every pass-off write, so the
 * Overview reads one indexed row per student instead of every pass-off.
 */
export const studentAttainment = pgTable(
  'student_attainment',
  {
    studentId: integer('student_id')
      .primaryKey()
      .references(() => students.id, { onDelete: 'cascade' }),
    // School, grade and status copied from the student (kept by triggers on students), so the
    // Overview counts from this one table.
    schoolId: integer('school_id'),
    grade: smallint('grade'),
    active: boolean('active').notNull().default(true),
    /** The student's cohort, copied from the student with the fields above. */
    cohortStartsOn: day('cohort_starts_on'),
    cohortGrade: smallint('cohort_grade'),
    /** Set when the student's seats changed: the rung is recomputed before the next read. */
    stale: boolean('stale').notNull().default(false),
    ladderVersionId: integer('ladder_version_id').references(() => ladderVersions.id, {
      onDelete: 'set null',
    }),
    /** The instrument family the rung was read for ('' when the student has no seat). */
    family: text('family').notNull().default(''),
    rung: smallint('rung').notNull().default(0),
    metCount: smallint('met_count').notNull().default(0),
    lastPassedOn: day('last_passed_on'),
    lastPassOffOn: day('last_pass_off_on'),
    /**
     * The fastest passed tempo of each requirement of the ladder version above, in the ladder's
     * order (rung by rung), null where never passed: the audition-ready list tests a student's
     * requirements in this one row instead of probing `passed_requirements` for each.
     */
    bestTempos: smallint('best_tempos').array(),
    /**
     * The day each rung was reached, rung 1 first (non-decreasing; as long as `rung`), worked out
     * by the ladder rules from the first day each requirement was passed at its tempo, so the
     * rung on any day is the count of these days up to it (PostgreSQL `width_bucket(day,
     * rung_dates)`). Kept with the rung, in the same writes; the year-over-year rung-by-grade
     * figure reads it.
     */
    rungDates: day('rung_dates').array(),
    updatedAt: moment('updated_at').notNull().defaultNow(),
  },
  (table) => [
    index('student_attainment_school_grade_rung_idx').on(
      table.schoolId,
      table.grade,
      table.rung,
      table.active,
    ),
    index('student_attainment_rung_idx').on(table.rung),
    index('student_attainment_last_pass_off_idx').on(table.lastPassOffOn),
    index('student_attainment_stale_idx')
      .on(table.studentId)
      .where(sql`stale`),
  ],
);

/** Each student's fastest passed tempo per requirement code, for the audition-ready list. */
export const passedRequirements = pgTable(
  'passed_requirements',
  {
    studentId: linkTo('student_id', () => students.id, 'cascade'),
    requirementCode: text('requirement_code').notNull(),
    bestTempo: smallint('best_tempo').notNull(),
    firstPassedOn: day('first_passed_on').notNull(),
  },
  (table) => [
    primaryKey({ columns: [table.studentId, table.requirementCode] }),
    index('passed_requirements_code_idx').on(table.requirementCode, table.bestTempo),
  ],
);

/** Pass-offs heard per week (Monday) by school and grade, kept current on every write. */
export const passOffWeeks = pgTable(
  'pass_off_weeks',
  {
    weekStart: day('week_start').notNull(),
    schoolId: linkTo('school_id', () => schools.id, 'cascade'),
    grade: smallint('grade').notNull(),
    heard: integer('heard').notNull().default(0),
    passed: integer('passed').notNull().default(0),
  },
  (table) => [primaryKey({ columns: [table.weekStart, table.schoolId, table.grade] })],
);
