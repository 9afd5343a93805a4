import { sql, type AnyColumn, type SQL } from 'drizzle-orm';
import {
  attainmentFiltersSchema,
  auditionReadyFiltersSchema,
  type AttainmentRow,
  type AuditionReadyRow,
} from '../../shared/api/analytics';
import type { ListResponse } from '../../shared/api/list';
import { benchmarksInForce } from '../../shared/ladder/index';
import type { Database } from '../db/client';
import { rowsOf } from '../db/client';
import { badRequest } from '../core/errors';
import { likePattern, orderFor, parseListQuery } from '../core/list-query';
import { schoolScope, type Actor } from '../core/policy';
import { activeRuleLadder } from '../ladder/ladder-queries';
import { daysBefore, studentCondition, today } from './analytics-scope';
import { topUpAttainment } from './overview-service';

const sortable = {
  lastName: sql`s.last_name`,
  grade: sql`s.grade`,
  school: sql`sc.code`,
  rung: sql`a.rung`,
  metCount: sql`a.met_count`,
  lastPassedOn: sql`a.last_passed_on`,
  lastPassOffOn: sql`a.last_pass_off_on`,
};
// The tie-breaker is the aliased student id; orderFor only wraps it in ASC/DESC.
const studentId = sql`s.id` as unknown as AnyColumn;

const attainmentColumns = sql`
  s.id, s.student_number as "studentNumber", s.first_name as "firstName", s.last_name as "lastName",
  s.grade::int as grade, s.school_id as "schoolId", sc.code as "schoolCode",
  a.rung::int as rung, a.met_count::int as "metCount",
  to_char(a.last_passed_on, 'YYYY-MM-DD') as "lastPassedOn",
  to_char(a.last_pass_off_on, 'YYYY-MM-DD') as "lastPassOffOn"`;

/**
 * The ORDER BY of a list: the requested field then the student id; by last name it follows the
 * students' (last_name, first_name, id) index, so a first page is read in index order.
 */
function orderOf(sort: string | undefined): SQL {
  const order = sql.join(orderFor(sort, sortable, 'lastName:asc', studentId), sql`, `);
  const [field, direction] = (sort ?? 'lastName:asc').split(':');
  if (field !== 'lastName') return order;
  const way = sql.raw(direction === 'desc' ? 'desc' : 'asc');
  return sql`s.last_name ${way}, s.first_name ${way}, s.id ${way}`;
}

function searchCondition(q: string | undefined): SQL {
  if (!q) return sql`true`;
  const pattern = likePattern(q);
  return sql`(lower(s.last_name) like ${pattern} or lower(s.first_name) like ${pattern} or s.student_number like ${pattern})`;
}

/**
 * `GET /api/analytics/students`: the students behind an Overview figure, with their rung and
 * the benchmark for their grade.
 */
export async function listAttainment(
  db: Database,
  actor: Actor,
  query: unknown,
): Promise<ListResponse<AttainmentRow>> {
  const list = parseListQuery(query, attainmentFiltersSchema);
  const asOf = list.asOf ?? today();
  await topUpAttainment(db);
  const ladder = await activeRuleLadder(db);
  const inForce = [...benchmarksInForce(ladder?.benchmarks ?? [], asOf).values()].map(
    ({ grade, rung }) => ({ grade, rung }),
  );
  const conditions: SQL[] = [studentCondition(actor, list), searchCondition(list.q)];
  if (list.rung !== undefined) conditions.push(sql`a.rung = ${list.rung}`);
  if (list.belowBenchmark) conditions.push(sql`a.rung < bm.rung`);
  if (list.atOrAboveBenchmark) conditions.push(sql`a.rung >= bm.rung`);
  if (list.stalledDays !== undefined) {
    conditions.push(
      sql`(a.last_pass_off_on is null or a.last_pass_off_on < ${daysBefore(asOf, list.stalledDays)}::date)`,
    );
  }
  const where = sql.join(conditions, sql` and `);
  const from = sql`
    from student_attainment a
    join students s on s.id = a.student_id
    join schools sc on sc.id = a.school_id
    left join json_to_recordset(${JSON.stringify(inForce)}::json) as bm(grade int, rung int) on bm.grade = a.grade`;
  const order = orderOf(list.sort);
  // The count needs the students' names only to search them.
  const countFrom = sql`
    from student_attainment a
    ${list.q ? sql`join students s on s.id = a.student_id` : sql``}
    left join json_to_recordset(${JSON.stringify(inForce)}::json) as bm(grade int, rung int) on bm.grade = a.grade`;
  const [rows, [total]] = await Promise.all([
    db.execute(
      sql`select ${attainmentColumns}, bm.rung as "benchmarkRung" ${from} where ${where} order by ${order} limit ${list.limit} offset ${list.offset}`,
    ),
    db
      .execute(sql`select count(*)::int as total ${countFrom} where ${where}`)
      .then((result) => rowsOf<{ total: number }>(result)),
  ]);
  return { rows: rowsOf<AttainmentRow>(rows), total: total!.total };
}

/** The audition-ready query's fields that choose the requirements or the page, not students. */
const notFilters = new Set(['requirementCodes', 'minTempo', 'offset', 'limit', 'sort']);

/** From how many qualifying students on, a page is found by walking the students in order. */
const denseAuditionResult = 1_000;

/**
 * `GET /api/analytics/audition-ready`: students who passed every chosen requirement at the
 * tempo asked (each requirement's own, or `minTempo`), from the fastest-pass summary.
 */
export async function auditionReady(
  db: Database,
  actor: Actor,
  query: unknown,
  options: { denseFrom?: number } = {},
): Promise<ListResponse<AuditionReadyRow>> {
  const list = parseListQuery(query, auditionReadyFiltersSchema);
  const ladder = await activeRuleLadder(db);
  const tempoByCode = new Map(
    ladder?.rungs.flatMap((rung) =>
      rung.requirements.map((requirement) => [requirement.id, requirement.tempo] as const),
    ) ?? [],
  );
  const codes = [...new Set(list.requirementCodes)];
  const unknown = codes.filter((code) => !tempoByCode.has(code));
  if (unknown.length) {
    throw badRequest(`The ladder in force has no requirement ${unknown.join(', ')}.`, [
      { field: 'requirementCodes', message: `Unknown requirement ${unknown.join(', ')}.` },
    ]);
  }
  const tempoOf = (code: string) => list.minTempo ?? tempoByCode.get(code)!;
  // OFFSET 0 keeps each test a per-student index probe instead of a semi-join the planner
  // weighs in every join order (planning a six-table join had cost more than running it).
  const passedBy = (code: string, alias: string) =>
    sql`exists (select 1 from passed_requirements ${sql.raw(alias)} where ${sql.raw(alias)}.student_id = s.id and ${sql.raw(alias)}.requirement_code = ${code} and ${sql.raw(alias)}.best_tempo >= ${tempoOf(code)} offset 0)`;
  const scoped = sql.join([studentCondition(actor, list), searchCondition(list.q)], sql` and `);
  // How many: the students of each requirement's fast-enough passes, intersected (one index
  // range per requirement and a hashed set operation), then the caller's scope and search.
  const passedAll = sql.join(
    codes.map(
      (code) =>
        sql`select student_id from passed_requirements where requirement_code = ${code} and best_tempo >= ${tempoOf(code)}`,
    ),
    sql` intersect `,
  );
  // The whole district with no filter counts every qualifier less the few who have left (a
  // small partial index), instead of matching every qualifier to its summary row.
  // Any filter or search (one added later too) takes the general count.
  const unfiltered = Object.entries(list).every(
    ([name, value]) => value === undefined || notFilters.has(name),
  );
  const wholeDistrict = schoolScope(actor) === 'all' && unfiltered;
  const [counted] = rowsOf<{ total: number }>(
    await db.execute(
      wholeDistrict
        ? sql`select (count(*) - count(a.student_id))::int as total from (${passedAll}) m
            left join student_attainment a on a.student_id = m.student_id and not a.active`
        : sql`select count(*)::int as total from (${passedAll}) m
            join student_attainment a on a.student_id = m.student_id
            ${list.q ? sql`join students s on s.id = m.student_id` : sql``}
            where ${scoped}`,
    ),
  );
  const total = counted!.total;
  if (total === 0 || list.offset >= total) return { rows: [], total };
  // Which page: when many students qualify, walk the students in the order asked and test each
  // (the page fills after a few hundred); when few do, start from the passes of the rarest
  // requirement (a higher rung is passed by fewer students) and sort that small set.
  const rungOfCode = new Map(
    ladder!.rungs.flatMap((rung) =>
      rung.requirements.map((requirement) => [requirement.id, rung.number] as const),
    ),
  );
  const [rarest] = [...codes].sort((one, two) => rungOfCode.get(two)! - rungOfCode.get(one)!);
  const dense = total >= (options.denseFrom ?? denseAuditionResult);
  const from = dense
    ? sql`from students s join student_attainment a on a.student_id = s.id join schools sc on sc.id = a.school_id`
    : sql`from passed_requirements r join students s on s.id = r.student_id
        join student_attainment a on a.student_id = r.student_id join schools sc on sc.id = a.school_id`;
  const passes = codes
    .filter((code) => dense || code !== rarest)
    .map((code, index) => passedBy(code, `p${index}`));
  const where = sql.join(
    [
      ...(dense
        ? []
        : [sql`r.requirement_code = ${rarest!} and r.best_tempo >= ${tempoOf(rarest!)}`]),
      ...passes,
      scoped,
    ],
    sql` and `,
  );
  const page = rowsOf<Omit<AuditionReadyRow, 'bestTempos'>>(
    await db.execute(sql`select s.id, s.student_number as "studentNumber", s.first_name as "firstName", s.last_name as "lastName",
      s.grade::int as grade, s.school_id as "schoolId", sc.code as "schoolCode", a.rung::int as rung
      ${from} where ${where} order by ${orderOf(list.sort)} limit ${list.limit} offset ${list.offset}`),
  );
  const pageRows = page;
  const best = pageRows.length
    ? rowsOf<{ student_id: number; tempos: Record<string, number> }>(
        await db.execute(sql`select p.student_id, json_object_agg(p.requirement_code, p.best_tempo) as tempos
          from passed_requirements p
          where p.student_id = any(${`{${pageRows.map((row) => row.id).join(',')}}`}::int[])
            and p.requirement_code = any(${`{${codes.join(',')}}`}::text[])
          group by p.student_id`),
      )
    : [];
  const tempos = new Map(best.map((row) => [row.student_id, row.tempos]));
  const rows = pageRows.map((row) => ({ ...row, bestTempos: tempos.get(row.id) ?? {} }));
  return { rows, total };
}
