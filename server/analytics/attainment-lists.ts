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
import type { Actor } from '../core/policy';
import { activeRuleLadder } from '../ladder/ladder-queries';
import { daysBefore, studentCondition, today } from './analytics-scope';
import { topUpAttainment } from './overview-service';

const sortable = {
  lastName: sql`lower(s.last_name)`,
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
  const order = sql.join(orderFor(list.sort, sortable, 'lastName:asc', studentId), sql`, `);
  const [rows, [total]] = await Promise.all([
    db.execute(
      sql`select ${attainmentColumns}, bm.rung as "benchmarkRung" ${from} where ${where} order by ${order} limit ${list.limit} offset ${list.offset}`,
    ),
    db
      .execute(sql`select count(*)::int as total ${from} where ${where}`)
      .then((result) => rowsOf<{ total: number }>(result)),
  ]);
  return { rows: rowsOf<AttainmentRow>(rows), total: total!.total };
}

/**
 * `GET /api/analytics/audition-ready`: students who passed every chosen requirement at the
 * tempo asked (each requirement's own, or `minTempo`), from the fastest-pass summary.
 */
export async function auditionReady(
  db: Database,
  actor: Actor,
  query: unknown,
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
  const chosen = JSON.stringify(
    codes.map((code) => ({ code, tempo: list.minTempo ?? tempoByCode.get(code)! })),
  );
  const from = sql`
    from (
      select p.student_id, json_object_agg(p.requirement_code, p.best_tempo) as best
      from passed_requirements p
      join json_to_recordset(${chosen}::json) as c(code text, tempo int) on c.code = p.requirement_code
      where p.requirement_code = any(${`{${codes.join(',')}}`}::text[]) and p.best_tempo >= c.tempo
      group by p.student_id
      having count(*) = ${codes.length}
    ) r
    join student_attainment a on a.student_id = r.student_id
    join students s on s.id = r.student_id
    join schools sc on sc.id = a.school_id`;
  const where = sql.join([studentCondition(actor, list), searchCondition(list.q)], sql` and `);
  const order = sql.join(orderFor(list.sort, sortable, 'lastName:asc', studentId), sql`, `);
  const [rows, [total]] = await Promise.all([
    db.execute(sql`select s.id, s.student_number as "studentNumber", s.first_name as "firstName", s.last_name as "lastName",
      s.grade::int as grade, s.school_id as "schoolId", sc.code as "schoolCode", a.rung::int as rung,
      r.best as "bestTempos" ${from} where ${where} order by ${order} limit ${list.limit} offset ${list.offset}`),
    db
      .execute(sql`select count(*)::int as total ${from} where ${where}`)
      .then((result) => rowsOf<{ total: number }>(result)),
  ]);
  return { rows: rowsOf<AuditionReadyRow>(rows), total: total!.total };
}
