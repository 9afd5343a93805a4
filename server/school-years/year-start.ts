import { PGlite } from '@electric-sql/pglite';
import { sql } from 'drizzle-orm';
import { rowsOf, type Database, type Transaction } from '../db/client';
import type { YearStartCounts, YearStartInput, YearStartResult } from '@shared/api/school-year';
import type { Actor } from '../core/policy';
import { recordAudit } from '../core/audit';
import { badRequest, HttpError } from '../core/errors';
import { topUpAttainment } from '../analytics/overview-service';
import { assertYearFits, currentSchoolYearRow } from './school-years-service';
import { dropSecondaryIndexes, skipReferenceTriggers } from '../imports/bulk-load';

/** The tables a start writes (see {@link skipReferenceTriggers}). */
const writtenTables = [
  'students',
  'student_years',
  'enrollments',
  'school_moves',
  'school_years',
  'cohort_rungs',
  'audit_log',
];

/**
 * The columns the start's update of the roster changes, on `students` and on the summary rows
 * (`student_attainment`) its trigger keeps: the indexes reading them are built again after it.
 */
const promotionColumns = [
  'grade',
  'school_id',
  'status',
  'version',
  'updated_at',
  'cohort_starts_on',
  'cohort_grade',
];

/** The steps of a start, in order, for a caller that reports progress. */
export type YearStartStep = 'planned' | 'history' | 'seats' | 'students' | 'switched';

/** How a start is asked for: a preview, or the commit (with the preview's basis when it had one). */
export interface YearStartOptions {
  commit: boolean;
  /** Called after each step of the commit, inside its transaction. */
  onStep?: (step: YearStartStep) => void | Promise<void>;
}

const emptyCounts = (): YearStartCounts => ({
  students: 0,
  promoted: 0,
  graduated: 0,
  movingUp: 0,
  leaving: 0,
  ensembles: 0,
  seats: 0,
  loansCarried: 0,
  loansDueBack: 0,
});

const stoppedByImport = (basis: number, latest: number) =>
  new HttpError(
    409,
    'roster_changed',
    `A roster import landed since the preview (import ${latest}, the preview saw ${basis || 'none'}). Nothing was changed: look at the preview again, then start the year.`,
  );

/**
 * The plan: one row per active student with the school and grade they start the new year in.
 * A student in grade 12 graduates; one in the last grade their school serves (or at a school
 * closed by the new year's first day) moves up to the school it sends to, or leaves when it
 * sends to none (or to one closed by then); every other student goes up one grade in place.
 */
async function writePlan(tx: Transaction, startsOn: string) {
  await tx.execute(sql`drop table if exists year_start_plan`);
  await tx.execute(sql`
    create temp table year_start_plan on commit drop as
    select s.id as student_id, s.school_id, s.grade,
      case
        when s.grade >= 12 then 'graduated'
        when (sc.highest_grade is not null and s.grade >= sc.highest_grade)
          or (sc.closed_on is not null and sc.closed_on <= ${startsOn}::date)
          then case when dest.id is null then 'leaving' else 'moving-up' end
        else 'promoted'
      end as outcome,
      dest.id as next_school_id, s.cohort_starts_on, s.cohort_grade
    from students s
    join schools sc on sc.id = s.school_id
    left join schools dest on dest.id = sc.sends_to_school_id
      and (dest.closed_on is null or dest.closed_on > ${startsOn}::date)
    where s.status = 'active'`);
  await tx.execute(sql`alter table year_start_plan add primary key (student_id)`);
  // A new temporary table has no statistics; without them the planner guesses its size and
  // joins the seats the slow way round (PostgreSQL manual 14.1.2: ANALYZE). The joins need its
  // size and the outcomes' shares, not fine histograms. The largest statistics target sets how
  // many rows ANALYZE samples (its reference page; 300 per unit of target in PostgreSQL's
  // analyze.c): at 10, 3,000 rows instead of the default's 30,000 (manual 19.7.4).
  await tx.execute(sql`select set_config('default_statistics_target', '10', true)`);
  await tx.execute(sql`analyze year_start_plan`);
  await tx.execute(sql`set local default_statistics_target to default`);
}

interface SchoolCountRow {
  school_id: number;
  code: string;
  name: string;
  sends_to: string | null;
  students: number;
  promoted: number;
  graduated: number;
  moving_up: number;
  leaving: number;
  ensembles: number;
  seats: number;
  loans_carried: number;
  loans_due_back: number;
}

async function countBySchool(
  tx: Transaction,
  fromYearId: number,
  fromEndsOn: string,
  startsOn: string,
  emptyEnsembles: boolean,
): Promise<SchoolCountRow[]> {
  return rowsOf<SchoolCountRow>(
    await tx.execute(sql`
      with outcomes as (
        select school_id, count(*)::int as students,
          count(*) filter (where outcome = 'promoted')::int as promoted,
          count(*) filter (where outcome = 'graduated')::int as graduated,
          count(*) filter (where outcome = 'moving-up')::int as moving_up,
          count(*) filter (where outcome = 'leaving')::int as leaving
        from year_start_plan group by school_id),
      carried_seats as (
        select p.school_id, count(*)::int as seats
        from year_start_plan p
        join enrollments en on en.student_id = p.student_id and en.school_year_id = ${fromYearId} and en.active
        join ensembles e on e.id = en.ensemble_id and e.school_id = p.school_id
        where p.outcome = 'promoted' and not ${emptyEnsembles}
        group by p.school_id),
      open_ensembles as (
        select e.school_id, count(*)::int as ensembles from ensembles e
        join schools sc on sc.id = e.school_id
        where sc.closed_on is null or sc.closed_on > ${startsOn}::date
        group by e.school_id),
      open_loans as (
        select school_id, count(*)::int as loans_carried,
          count(*) filter (where due_on <= ${fromEndsOn}::date)::int as loans_due_back
        from loans where state = 'active' group by school_id)
      select sc.id as school_id, sc.code, sc.name, dest.code as sends_to,
        coalesce(o.students, 0) as students, coalesce(o.promoted, 0) as promoted,
        coalesce(o.graduated, 0) as graduated, coalesce(o.moving_up, 0) as moving_up,
        coalesce(o.leaving, 0) as leaving, coalesce(oe.ensembles, 0) as ensembles,
        coalesce(cs.seats, 0) as seats, coalesce(l.loans_carried, 0) as loans_carried,
        coalesce(l.loans_due_back, 0) as loans_due_back
      from schools sc
      left join schools dest on dest.id = sc.sends_to_school_id
      left join outcomes o on o.school_id = sc.id
      left join carried_seats cs on cs.school_id = sc.id
      left join open_ensembles oe on oe.school_id = sc.id
      left join open_loans l on l.school_id = sc.id
      order by sc.name`),
  );
}

/** Each school's counts as the answer gives them, and the district's totals. */
function schoolBySchool(rows: SchoolCountRow[]) {
  const totals = emptyCounts();
  const schools = rows.map((row) => {
    const counts: YearStartCounts = {
      students: row.students,
      promoted: row.promoted,
      graduated: row.graduated,
      movingUp: row.moving_up,
      leaving: row.leaving,
      ensembles: row.ensembles,
      seats: row.seats,
      loansCarried: row.loans_carried,
      loansDueBack: row.loans_due_back,
    };
    for (const key of Object.keys(totals) as (keyof YearStartCounts)[]) totals[key] += counts[key];
    return {
      schoolId: row.school_id,
      code: row.code,
      name: row.name,
      sendsTo: row.sends_to,
      ...counts,
    };
  });
  return { totals, schools };
}

async function unplacedStudents(tx: Transaction) {
  return rowsOf<YearStartResult['unplaced'][number]>(
    await tx.execute(sql`
      select s.id as "studentId", s.student_number as "studentNumber",
        coalesce(s.preferred_name, s.first_name) || ' ' || s.last_name as name,
        sc.code as "schoolCode", s.grade
      from year_start_plan p join students s on s.id = p.student_id join schools sc on sc.id = p.school_id
      where p.outcome = 'leaving'
      order by sc.code, s.last_name, s.first_name, s.id`),
  );
}

async function dueBackLoans(tx: Transaction, fromEndsOn: string) {
  return rowsOf<YearStartResult['dueBack'][number]>(
    await tx.execute(sql`
      select l.id as "loanId", i.asset_tag as "assetTag",
        coalesce(s.preferred_name, s.first_name) || ' ' || s.last_name as "studentName",
        sc.code as "schoolCode", to_char(l.due_on, 'YYYY-MM-DD') as "dueOn"
      from loans l join instruments i on i.id = l.instrument_id
      join students s on s.id = l.student_id join schools sc on sc.id = l.school_id
      where l.state = 'active' and l.due_on <= ${fromEndsOn}::date
      order by sc.code, l.due_on, i.asset_tag`),
  );
}

/** The last committed roster import: a start previewed before it must be previewed again. */
async function latestRosterImport(tx: Transaction): Promise<number> {
  const [row] = rowsOf<{ id: number }>(
    await tx.execute(
      sql`select coalesce(max(id), 0)::int as id from roster_imports where committed`,
    ),
  );
  return row!.id;
}

/** The closed year as the start reads it. */
interface ClosedYear {
  id: number;
  name: string;
  startsOn: string;
}

/** The closed year's history: one row per player and per withdrawn student who had a seat. */
async function writeHistory(tx: Transaction, fromYear: ClosedYear) {
  // Where every student stood in the old year, with their rung (and rung dates) at its end. Whether
  // each played on is known here: those promoted or moving up are active in the new year, the rest are not.
  await tx.execute(sql`
    insert into student_years
      (student_id, school_year_id, school_id, grade, outcome, rung, continued, rung_dates)
    select p.student_id, ${fromYear.id}::int, p.school_id, p.grade, p.outcome, coalesce(a.rung, 0),
      p.outcome in ('promoted', 'moving-up'), a.rung_dates
    from year_start_plan p left join student_attainment a on a.student_id = p.student_id
    union all
    select s.id, ${fromYear.id}::int, s.school_id, s.grade, 'withdrawn', coalesce(a.rung, 0), false,
      a.rung_dates
    from students s left join student_attainment a on a.student_id = s.id
    where s.status = 'withdrawn' and exists (
      select 1 from enrollments en where en.student_id = s.id and en.school_year_id = ${fromYear.id})
    on conflict (student_id, school_year_id) do nothing`);
}

/** The continuing students' seats, copied into the new year. */
async function carrySeats(tx: Transaction, fromYear: ClosedYear, newYearId: number) {
  await tx.execute(sql`
      insert into enrollments (student_id, ensemble_id, school_year_id, instrument_id, part, chair)
      select en.student_id, en.ensemble_id, ${newYearId}::int, en.instrument_id, en.part, en.chair
      from year_start_plan p
      join enrollments en on en.student_id = p.student_id and en.school_year_id = ${fromYear.id} and en.active
      join ensembles e on e.id = en.ensemble_id and e.school_id = p.school_id
      where p.outcome = 'promoted'
      order by en.id`);
}

/** The roster moves on (grades, schools, statuses, cohorts); the school moves; the cohorts' points. */
async function moveRoster(
  tx: Transaction,
  actor: Actor | null,
  fromYear: ClosedYear,
  embedded: boolean,
) {
  // The update changes the grade, school, status, version, last change and cohort of students
  // and their summary rows. In the embedded engine the few indexes that read those columns
  // (grade, school, status and last-change sorts, the summary's school-grade-rung) are dropped
  // and built again after the one update (PostgreSQL manual 14.4.3 "Remove Indexes", as a bulk
  // roster load does in bulk-load.ts): with no indexed column changed, each new row version is
  // written on its old one's page as a heap-only tuple that none of the other indexes (the key,
  // the student number, the name sorts and the four searches) takes an entry for (PostgreSQL
  // manual, "Heap-Only Tuples (HOT)"; the room on the page is kept by the tables' fillfactor,
  // custom migration students-fillfactor). Measured at 48,477 students: 90% of the roster's
  // updates and every summary row's heap-only; the roster step's CPU time 1.9 s against 3.8 s
  // with every secondary index dropped and built again. Built after heap-only updates, those
  // indexes serve only later transactions (PostgreSQL's README.HOT, "CREATE INDEX"); nothing
  // after the update here reads the roster by them. On a PostgreSQL server dropping an index
  // would lock the table against readers, so they stay.
  const rebuild = embedded
    ? await dropSecondaryIndexes(
        async (text) => rowsOf(await tx.execute(sql.raw(text))),
        ['students', 'student_attainment'],
        promotionColumns,
      )
    : [];
  await tx.execute(sql`
    update students s set
      grade = case when p.outcome in ('promoted', 'moving-up') then s.grade + 1 else s.grade end,
      school_id = case when p.outcome = 'moving-up' then p.next_school_id else s.school_id end,
      status = case p.outcome when 'graduated' then 'graduated' when 'leaving' then 'leaving' else 'active' end,
      cohort_starts_on = coalesce(s.cohort_starts_on, ${fromYear.startsOn}::date),
      cohort_grade = coalesce(s.cohort_grade, s.grade),
      version = s.version + 1, updated_at = now()
    from year_start_plan p where s.id = p.student_id`);
  for (const definition of rebuild) await tx.execute(sql.raw(definition));
  await tx.execute(sql`
    insert into school_moves (student_id, from_school_id, to_school_id, moved_by)
    select student_id, school_id, next_school_id, ${actor?.userId ?? null}::int
    from year_start_plan where outcome = 'moving-up'`);
  // The closed year's points of the cohorts' climb, each player's cohort as the update above set
  // it, read from the plan (one hashed join of two scans instead of a probe of the roster per row).
  await tx.execute(sql`
    insert into cohort_rungs (cohort_starts_on, cohort_grade, year_starts_on, school_id, rung, students)
    select coalesce(p.cohort_starts_on, ${fromYear.startsOn}::date), coalesce(p.cohort_grade, p.grade),
      ${fromYear.startsOn}::date, sy.school_id, sy.rung, count(*)::int
    from student_years sy join year_start_plan p on p.student_id = sy.student_id
    where sy.school_year_id = ${fromYear.id} and sy.outcome <> 'withdrawn'
    group by 1, 2, 3, 4, 5`);
}

/**
 * The new year becomes the current one, the year before the closed one is looked at again, and
 * the summaries' row-by-row upkeep resumes.
 */
async function switchYears(tx: Transaction, fromYear: ClosedYear, newYearId: number) {
  await tx.execute(
    sql`update school_years set current = false, updated_at = now() where id = ${fromYear.id}`,
  );
  await tx.execute(
    sql`update school_years set current = true, updated_at = now() where id = ${newYearId}`,
  );
  // The year before the closed one now looks ahead to a year of history instead of the roster.
  const [before] = rowsOf<{ id: number }>(
    await tx.execute(sql`
      select id from school_years
      where starts_on < (select starts_on from school_years where id = ${fromYear.id})
      order by starts_on desc limit 1`),
  );
  if (before) await tx.execute(sql`select refresh_student_years_continued_of(${before.id}::int)`);
  await tx.execute(sql`select set_config('tutti.year_start', 'off', true)`);
}

/** Writes the start: history of the old year, the new year's seats, the roster, the switch. */
async function applyPlan(
  tx: Transaction,
  actor: Actor | null,
  input: YearStartInput,
  fromYear: ClosedYear,
  onStep: YearStartOptions['onStep'],
  embedded: boolean,
) {
  const [created] = rowsOf<{ id: number }>(
    await tx.execute(sql`
      insert into school_years (name, starts_on, ends_on, current)
      values (${input.name}, ${input.startsOn}::date, ${input.endsOn}::date, false) returning id`),
  );
  const newYearId = created!.id;
  // The summaries' row-by-row upkeep waits for the end of this transaction (custom migration
  // year-start-quiet-triggers says which and why); student_years.continued is written with the
  // history below.
  await tx.execute(sql`select set_config('tutti.year_start', 'on', true)`);
  await onStep?.('planned');
  // Every id written below was read in this transaction: in the embedded engine, where this is
  // the only transaction, the per-row foreign-key checks are skipped (bulk-load.ts says how).
  if (embedded) {
    await skipReferenceTriggers(
      {
        query: async <Row>(text: string) => rowsOf<Row>(await tx.execute(sql.raw(text))),
      },
      writtenTables,
    );
  }
  await writeHistory(tx, fromYear);
  await onStep?.('history');
  if (!input.emptyEnsembles) await carrySeats(tx, fromYear, newYearId);
  await onStep?.('seats');
  await moveRoster(tx, actor, fromYear, embedded);
  await onStep?.('students');
  await switchYears(tx, fromYear, newYearId);
  await onStep?.('switched');
}

/**
 * Previews or commits the start of a new school year. The preview and the commit run the same
 * plan; the commit runs it again inside its one transaction, so what it writes is what the
 * roster holds at that moment, and it stops when a roster import landed after the preview.
 * A refusal (400) or a stop (409) writes nothing; so does any failure, the transaction being
 * one.
 */
export async function startSchoolYear(
  db: Database,
  actor: Actor | null,
  input: YearStartInput,
  options: YearStartOptions,
): Promise<YearStartResult> {
  // Rungs read at the old year's end are exact only once the stale summaries are recomputed.
  if (options.commit) await topUpAttainment(db);
  return db.transaction(async (tx) => {
    // No roster import or seat change slips between the plan and the writes (PostgreSQL
    // manual 13.3.1: SHARE ROW EXCLUSIVE conflicts with every writer's ROW EXCLUSIVE).
    if (options.commit) {
      await tx.execute(
        sql`lock table students, enrollments, school_years in share row exclusive mode`,
      );
    }
    const fromYear = await currentSchoolYearRow(tx);
    if (!fromYear) throw badRequest('There is no current school year to start from.');
    await assertYearFits(tx, input);
    if (input.startsOn <= fromYear.endsOn) {
      throw badRequest(
        `${input.name} must start after the current year ${fromYear.name} ends (${fromYear.endsOn}).`,
        [{ field: 'startsOn', message: `Start after ${fromYear.endsOn}.` }],
      );
    }
    const basis = await latestRosterImport(tx);
    if (options.commit && input.basis !== undefined && input.basis !== basis) {
      throw stoppedByImport(input.basis, basis);
    }
    await writePlan(tx, input.startsOn);
    const rows = await countBySchool(
      tx,
      fromYear.id,
      fromYear.endsOn,
      input.startsOn,
      input.emptyEnsembles,
    );
    const { totals, schools } = schoolBySchool(rows);
    const result: YearStartResult = {
      year: input.name,
      startsOn: input.startsOn,
      endsOn: input.endsOn,
      fromYear: fromYear.name,
      emptyEnsembles: input.emptyEnsembles,
      committed: false,
      basis,
      ...totals,
      schools,
      unplaced: await unplacedStudents(tx),
      dueBack: await dueBackLoans(tx, fromYear.endsOn),
    };
    if (!options.commit) return result;
    // Drizzle's PGlite driver keeps the engine as `$client` (a pool in server mode).
    const embedded = (db as { $client?: unknown }).$client instanceof PGlite;
    await applyPlan(tx, actor, input, fromYear, options.onStep, embedded);
    await recordAudit(tx, actor, {
      action: 'start-year',
      entity: 'school-year',
      entityId: input.name,
      before: { current: fromYear.name },
      after: { current: input.name, ...totals, emptyEnsembles: input.emptyEnsembles },
    });
    return { ...result, committed: true };
  });
}
