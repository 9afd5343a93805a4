import { sql, type AnyColumn, type SQL } from 'drizzle-orm';
import {
  attainmentFiltersSchema,
  auditionReadyFiltersSchema,
  type AttainmentRow,
  type AuditionReadyRow,
} from '@shared/api/analytics';
import type { ListResponse } from '@shared/api/list';
import { benchmarksInForce } from '@shared/ladder/index';
import type { Database } from '../db/client';
import { intArray, rowsOf } from '../db/client';
import { badRequest } from '../core/errors';
import { likePattern, orderFor, parseListQuery } from '../core/list-query';
import type { Actor } from '../core/policy';
import { activeRuleLadder } from '../ladder/ladder-queries';
import { bestTempoCodes } from '../ladder/attainment';
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

/** From how many qualifying students on, a page is found by walking the students in order. */
const denseAuditionResult = 1_000;

/**
 * `GET /api/analytics/audition-ready`: students who passed every chosen requirement at the
 * tempo asked (each requirement's own, or `minTempo`), from each student's fastest tempos in
 * their summary row (`student_attainment.best_tempos`, kept with the rung on every write).
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
  if (!ladder || unknown.length) {
    throw badRequest(`The ladder in force has no requirement ${unknown.join(', ')}.`, [
      { field: 'requirementCodes', message: `Unknown requirement ${unknown.join(', ')}.` },
    ]);
  }
  const tempoOf = (code: string) => list.minTempo ?? tempoByCode.get(code)!;
  // PostgreSQL arrays count from 1.
  const slots = new Map(bestTempoCodes(ladder.rungs).map((code, index) => [code, index + 1]));
  const slotOf = (code: string) => sql.raw(String(slots.get(code)!));
  // Every chosen requirement at its tempo, read from the student's one summary row. The row
  // must be of the ladder in force (every row is rewritten when a version is published).
  const passedAll = sql.join(
    [
      sql`a.ladder_version_id = ${ladder.versionId}`,
      ...codes.map((code) => sql`a.best_tempos[${slotOf(code)}] >= ${tempoOf(code)}`),
    ],
    sql` and `,
  );
  const inScope = studentCondition(actor, list);
  const search = searchCondition(list.q);
  // How many, in one pass over the summary rows (the students' names only to search them);
  // when they are few, also which: the page is then read by id instead of a second pass.
  const denseFrom = Math.min(options.denseFrom ?? denseAuditionResult, 2 ** 31 - 1);
  const [counted] = rowsOf<{ total: number; ids: number[] | null }>(
    await db.execute(sql`select count(*)::int as total,
        case when count(*) < ${denseFrom} then array_agg(a.student_id) end as ids
      from student_attainment a
      ${list.q ? sql`join students s on s.id = a.student_id` : sql``}
      where ${passedAll} and ${inScope} and ${search}`),
  );
  const { total, ids } = counted!;
  if (total === 0 || list.offset >= total) return { rows: [], total };
  // Which page: when many students qualify, walk the students in the order asked and test each
  // (the page fills after a few hundred rows); when few do, sort those the count found.
  const found = ids ? sql`a.student_id = any(${intArray(ids)}::int[]) and ` : sql``;
  const page = rowsOf<Omit<AuditionReadyRow, 'bestTempos'> & { tempos: number[] }>(
    await db.execute(sql`select s.id, s.student_number as "studentNumber", s.first_name as "firstName", s.last_name as "lastName",
      s.grade::int as grade, s.school_id as "schoolId", sc.code as "schoolCode", a.rung::int as rung,
      array[${sql.join(
        codes.map((code) => sql`a.best_tempos[${slotOf(code)}]`),
        sql`, `,
      )}]::int[] as tempos
      from students s join student_attainment a on a.student_id = s.id
      join schools sc on sc.id = a.school_id
      where ${found}${passedAll} and ${inScope} and ${search}
      order by ${orderOf(list.sort)} limit ${list.limit} offset ${list.offset}`),
  );
  const rows = page.map(({ tempos, ...row }) => ({
    ...row,
    bestTempos: Object.fromEntries(codes.map((code, index) => [code, tempos[index]!])),
  }));
  return { rows, total };
}
