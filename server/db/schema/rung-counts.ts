import { boolean, date, integer, pgTable, smallint, unique } from 'drizzle-orm/pg-core';

/** The columns both counts share: how many students of a school and grade, at a rung. */
const schoolGradeRung = () => ({
  schoolId: integer('school_id'),
  grade: smallint('grade'),
  rung: smallint('rung').notNull(),
  students: integer('students').notNull(),
});

/**
 * How many active students (the `student_attainment` rows with `active`) stand at each rung, by
 * school, grade and cohort (the summary row's own fields, cohort fields null until the student's
 * first year is closed), and by how many rung dates they carry (`cardinality(rung_dates)`).
 * Kept exact by statement-level triggers on `student_attainment` (custom migration
 * `active-rung-counts-triggers`), so the cohort climb's point for this year and rung by grade's
 * head counts read a few hundred rows instead of every summary row. Rows whose count fell to
 * zero stay; readers take groups whose sum is above zero.
 */
export const activeRungCounts = pgTable(
  'active_rung_counts',
  {
    ...schoolGradeRung(),
    cohortStartsOn: date('cohort_starts_on', { mode: 'string' }),
    cohortGrade: smallint('cohort_grade'),
    /** The number of rung dates: the rungs reached on some day (`rung` itself, in practice). */
    dated: smallint('dated').notNull(),
  },
  (table) => [
    unique('active_rung_counts_key')
      .on(
        table.schoolId,
        table.grade,
        table.cohortStartsOn,
        table.cohortGrade,
        table.rung,
        table.dated,
      )
      .nullsNotDistinct(),
  ],
);

/**
 * How many active students with a grade reached each rung on each day, by school and grade: one
 * count for each element of their `rung_dates` (the element's place is the rung). Kept by the
 * same triggers. The rung of a grade's students on a day is then the head count of
 * `active_rung_counts` less the rung dates after that day, which sit at the end of the key
 * (`reached_on` first), a short range read whatever the years of history behind them.
 */
export const activeRungDays = pgTable(
  'active_rung_days',
  {
    reachedOn: date('reached_on', { mode: 'string' }).notNull(),
    // Written only for students with a grade.
    ...schoolGradeRung(),
  },
  (table) => [
    unique('active_rung_days_key')
      .on(table.reachedOn, table.schoolId, table.grade, table.rung)
      .nullsNotDistinct(),
  ],
);

/**
 * Set (one row) when a statement of a new year's start left the two tables above to be worked out
 * again in full at its commit, which a deferred trigger on this table does (one pass over the
 * summary rows instead of the old and new versions of each).
 */
export const activeRungRebuilds = pgTable('active_rung_rebuilds', {
  pending: boolean('pending').primaryKey(),
});
