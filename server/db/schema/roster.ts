import {
  index,
  integer,
  jsonb,
  pgTable,
  smallint,
  text,
  uniqueIndex,
  boolean,
  primaryKey,
} from 'drizzle-orm/pg-core';
import { sql } from 'drizzle-orm';
import { ensembleKinds } from '../../../shared/api/ensemble';
import { identity, timestamps, version, moment, day, linkTo } from './columns';
import { schoolYears, schools } from './schools';
import { actedBy, users } from './people';

/** A music student, keyed by the district's student id from the student information system. */
export const students = pgTable(
  'students',
  {
    ...identity,
    studentNumber: text('student_number').notNull(),
    firstName: text('first_name').notNull(),
    lastName: text('last_name').notNull(),
    preferredName: text('preferred_name'),
    /** 0 is kindergarten. */
    grade: smallint('grade').notNull(),
    schoolId: linkTo('school_id', () => schools.id),
    status: text('status', { enum: ['active', 'withdrawn', 'graduated', 'leaving'] })
      .notNull()
      .default('active'),
    guardianName: text('guardian_name'),
    guardianEmail: text('guardian_email'),
    /**
     * The student's cohort: the first day of the first school year they played in on record and
     * their grade then. Null until a year they played in is closed (until then their cohort is
     * the current year and grade). Written by the year start in its one update of the roster.
     */
    cohortStartsOn: day('cohort_starts_on'),
    cohortGrade: smallint('cohort_grade'),
    ...version,
    ...timestamps,
  },
  (table) => [
    uniqueIndex('students_student_number_unique').on(table.studentNumber),
    index('students_school_idx').on(table.schoolId, table.lastName, table.firstName, table.id),
    index('students_name_idx').on(table.lastName, table.firstName, table.id),
    index('students_grade_idx').on(table.grade, table.lastName, table.id),
    index('students_last_name_search_idx').using(
      'btree',
      sql`lower(${table.lastName}) text_pattern_ops`,
    ),
    // The roster list's other sorts and its prefix search on ids and names.
    index('students_first_name_idx').on(table.firstName, table.lastName, table.id),
    index('students_status_idx').on(table.status, table.lastName, table.firstName, table.id),
    index('students_updated_idx').on(table.updatedAt, table.id),
    index('students_first_name_search_idx').using(
      'btree',
      sql`lower(${table.firstName}) text_pattern_ops`,
    ),
    index('students_preferred_name_search_idx').using(
      'btree',
      sql`lower(${table.preferredName}) text_pattern_ops`,
    ),
    index('students_number_search_idx').using(
      'btree',
      sql`lower(${table.studentNumber}) text_pattern_ops`,
    ),
  ],
);

/**
 * How many students each school has in each grade and status, kept exact by statement-level
 * triggers on `students` (migration 0009), so a list's total and a school's head count read a
 * few dozen rows instead of counting the roster.
 */
export const studentCounts = pgTable(
  'student_counts',
  {
    schoolId: integer('school_id').notNull(),
    grade: smallint('grade').notNull(),
    status: text('status').notNull(),
    students: integer('students').notNull(),
  },
  (table) => [primaryKey({ columns: [table.schoolId, table.grade, table.status] })],
);

/**
 * Where each student stood in a past school year, written when the next year starts: the
 * school and grade of that year, how the year ended for them, and their rung at its end.
 */
export const studentYears = pgTable(
  'student_years',
  {
    studentId: linkTo('student_id', () => students.id, 'cascade'),
    schoolYearId: linkTo('school_year_id', () => schoolYears.id),
    schoolId: linkTo('school_id', () => schools.id),
    grade: integer('grade').notNull(),
    /** How the year ended: promoted, moving-up, graduated, leaving, withdrawn. */
    outcome: text('outcome', {
      enum: ['promoted', 'moving-up', 'graduated', 'leaving', 'withdrawn'],
    }).notNull(),
    rung: integer('rung').notNull().default(0),
    /**
     * Whether the student played in the school year after this one: active now when that year is
     * the current one, else a row of that year that did not end withdrawn. Kept by triggers
     * (custom migration `yoy-summary-triggers`) so year-over-year retention is a grouped count.
     */
    continued: boolean('continued').notNull().default(false),
    /**
     * The student's rung dates (as `student_attainment.rung_dates`) when the year was closed: the
     * rung on any day of that year is `width_bucket(day, rung_dates)`, read from this row alone.
     */
    rungDates: day('rung_dates').array(),
  },
  (table) => [
    primaryKey({ columns: [table.studentId, table.schoolYearId] }),
    index('student_years_year_school_idx').on(table.schoolYearId, table.schoolId, table.grade),
    index('student_years_year_continued_idx').on(table.schoolYearId, table.continued),
  ],
);

/**
 * The cohorts' climb through the closed years: how many of a cohort (first year on record and
 * grade then) played at a school in a closed year and ended it on a rung. Written once, when the
 * year is closed by the start of the next (history does not change after), so the year-over-year
 * figure reads a few hundred rows instead of every student's history.
 */
export const cohortRungs = pgTable(
  'cohort_rungs',
  {
    cohortStartsOn: day('cohort_starts_on').notNull(),
    cohortGrade: smallint('cohort_grade').notNull(),
    yearStartsOn: day('year_starts_on').notNull(),
    schoolId: linkTo('school_id', () => schools.id),
    rung: smallint('rung').notNull(),
    students: integer('students').notNull(),
  },
  (table) => [
    primaryKey({
      columns: [
        table.cohortStartsOn,
        table.cohortGrade,
        table.yearStartsOn,
        table.schoolId,
        table.rung,
      ],
    }),
  ],
);

/** A band, orchestra or other group that meets at one school. */
export const ensembles = pgTable(
  'ensembles',
  {
    ...identity,
    schoolId: linkTo('school_id', () => schools.id),
    name: text('name').notNull(),
    kind: text('kind', { enum: ensembleKinds }).notNull(),
    level: text('level').notNull().default(''),
    directorUserId: actedBy('director_user_id'),
    meetingPeriod: text('meeting_period').notNull().default(''),
    ...version,
    ...timestamps,
  },
  (table) => [uniqueIndex('ensembles_school_name_unique').on(table.schoolId, table.name)],
);

/** A student's seat in one ensemble for one school year, on one instrument. */
export const enrollments = pgTable(
  'enrollments',
  {
    ...identity,
    studentId: linkTo('student_id', () => students.id, 'cascade'),
    ensembleId: linkTo('ensemble_id', () => ensembles.id, 'cascade'),
    schoolYearId: linkTo('school_year_id', () => schoolYears.id),
    instrumentId: text('instrument_id'),
    part: text('part').notNull().default(''),
    chair: smallint('chair'),
    active: boolean('active').notNull().default(true),
    ...version,
    ...timestamps,
  },
  (table) => [
    uniqueIndex('enrollments_seat_unique').on(
      table.studentId,
      table.ensembleId,
      table.schoolYearId,
    ),
    index('enrollments_ensemble_idx').on(table.ensembleId),
    index('enrollments_instrument_idx').on(table.instrumentId, table.schoolYearId),
  ],
);

/** A move of a student from one school to another; the student keeps their history. */
export const schoolMoves = pgTable(
  'school_moves',
  {
    ...identity,
    studentId: linkTo('student_id', () => students.id, 'cascade'),
    fromSchoolId: integer('from_school_id').references(() => schools.id),
    toSchoolId: linkTo('to_school_id', () => schools.id),
    movedAt: moment('moved_at').notNull().defaultNow(),
    movedBy: actedBy('moved_by'),
  },
  (table) => [index('school_moves_student_idx').on(table.studentId)],
);

/** One roster upload: what it did, and the errors it found. */
export const rosterImports = pgTable(
  'roster_imports',
  {
    ...identity,
    userId: actedBy('user_id'),
    fileName: text('file_name').notNull(),
    source: text('source').notNull(),
    via: text('via', { enum: ['wizard', 'cli', 'api'] }).notNull(),
    committed: boolean('committed').notNull(),
    rows: integer('rows').notNull(),
    created: integer('created').notNull(),
    updated: integer('updated').notNull(),
    unchanged: integer('unchanged').notNull(),
    withdrawn: integer('withdrawn').notNull(),
    errors: jsonb('errors').notNull().default([]),
    /** The schools whose students a committed import wrote (the valid rows' schools). */
    schoolIds: integer('school_ids')
      .array()
      .notNull()
      .default(sql`'{}'::integer[]`),
    /** The school year its seats were written in. */
    schoolYearId: integer('school_year_id').references(() => schoolYears.id),
    /** When, and by whom, the import was taken back (import-undo.ts). */
    undoneAt: moment('undone_at'),
    undoneBy: actedBy('undone_by'),
    ...timestamps,
  },
  (table) => [index('roster_imports_created_idx').on(table.createdAt)],
);

/**
 * What a committed roster import wrote, one row per student, seat or ensemble, so the import
 * can be taken back: the values it replaced (`before`) and the row's version once it wrote it.
 */
export const rosterImportChanges = pgTable(
  'roster_import_changes',
  {
    ...identity,
    importId: linkTo('import_id', () => rosterImports.id, 'cascade'),
    kind: text('kind', {
      enum: [
        'student-created',
        'student-updated',
        'student-withdrawn',
        'seat-added',
        'seat-changed',
        'seat-ended',
        'ensemble-created',
      ],
    }).notNull(),
    studentId: integer('student_id'),
    enrollmentId: integer('enrollment_id'),
    ensembleId: integer('ensemble_id'),
    before: jsonb('before'),
    versionAfter: integer('version_after'),
  },
  (table) => [index('roster_import_changes_import_idx').on(table.importId, table.kind)],
);

/**
 * Students and ensembles a large roster import has added ahead of its final transaction, by
 * the import's run (one of the two per row). The final transaction deletes its run's rows; rows
 * found at the next start belong to an import that never finished, and what they name is taken
 * back out (see landed-students.ts).
 */
export const rosterImportLandings = pgTable(
  'roster_import_landings',
  {
    run: text('run').notNull(),
    studentId: integer('student_id').references(() => students.id, { onDelete: 'cascade' }),
    ensembleId: integer('ensemble_id').references(() => ensembles.id, { onDelete: 'cascade' }),
  },
  (table) => [index('roster_import_landings_run_idx').on(table.run)],
);

/** A saved column mapping for one source system's export. */
export const importPresets = pgTable(
  'import_presets',
  {
    ...identity,
    name: text('name').notNull(),
    kind: text('kind').notNull().default('roster'),
    mapping: jsonb('mapping').notNull(),
    ...timestamps,
  },
  (table) => [uniqueIndex('import_presets_name_unique').on(table.kind, table.name)],
);

/** A user's remembered grid layout (columns shown, order, widths). */
export const gridPreferences = pgTable(
  'grid_preferences',
  {
    userId: linkTo('user_id', () => users.id, 'cascade'),
    grid: text('grid').notNull(),
    state: jsonb('state').notNull(),
    ...timestamps,
  },
  (table) => [uniqueIndex('grid_preferences_unique').on(table.userId, table.grid)],
);
