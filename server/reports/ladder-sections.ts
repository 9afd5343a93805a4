import { sql } from 'drizzle-orm';
import { rowsOf, oneByOne } from '../db/client';
import { benchmarksInForce, type Benchmark } from '@shared/ladder/benchmarks';
import type { DirectorReportData, ReportStudent } from '@shared/api/report';
import { notAvailable, tablesExist, type Queryable } from './report-tables';

/** Days without a pass-off before a student counts as stalled (the Overview's default too). */
export const stalledDays = 30;

/** Rungs above the grade's benchmark that make a student audition-ready (our own rule). */
export const auditionRungsAboveBenchmark = 2;

/** One active student of the school with their standing on the active ladder. */
export interface StudentStanding extends ReportStudent {
  id: number;
}

/** The school's active students with their rung and benchmark, as on the period's last day. */
export async function studentStandings(
  db: Queryable,
  schoolId: number,
  to: string,
): Promise<StudentStanding[] | null> {
  if (
    !(await tablesExist(
      db,
      'ladder_versions',
      'ladder_benchmarks',
      'student_attainment',
      'pass_offs',
    ))
  ) {
    return null;
  }
  const [benchmarkRows, studentRows] = await oneByOne(
    () =>
      db.execute(sql`
      select b.grade::int as grade, b.rung::int as rung, to_char(b.by_date, 'YYYY-MM-DD') as "byDate"
      from ladder_benchmarks b join ladder_versions v on v.id = b.ladder_version_id and v.active`),
    () =>
      db.execute(sql`
      select s.id, s.student_number as "studentNumber",
        coalesce(nullif(s.preferred_name, ''), s.first_name) || ' ' || s.last_name as name,
        s.grade::int as grade, coalesce(a.rung, 0)::int as rung,
        (select to_char(max(p.heard_on) filter (where p.passed), 'YYYY-MM-DD') from pass_offs p
          where p.student_id = s.id and p.heard_on <= ${to}::date) as "lastPassedOn",
        (select to_char(max(p.heard_on), 'YYYY-MM-DD') from pass_offs p
          where p.student_id = s.id and p.heard_on <= ${to}::date) as "lastPassOffOn"
      from students s left join student_attainment a on a.student_id = s.id
      where s.school_id = ${schoolId} and s.status = 'active'
      order by s.last_name, s.first_name, s.id`),
  );
  const inForce = benchmarksInForce(rowsOf<Benchmark>(benchmarkRows), to);
  return rowsOf<Omit<StudentStanding, 'benchmarkRung'>>(studentRows).map((student) => ({
    ...student,
    benchmarkRung: inForce.get(student.grade)?.rung ?? null,
  }));
}

/** Students by rung, and by grade the share at or above the grade's benchmark. */
export function ladderSection(standings: StudentStanding[] | null): DirectorReportData['ladder'] {
  if (!standings) return notAvailable('Ladder standings');
  const byRung = new Map<number, number>();
  const byGrade = new Map<
    number,
    { students: number; benchmarkRung: number | null; atOrAbove: number }
  >();
  for (const student of standings) {
    byRung.set(student.rung, (byRung.get(student.rung) ?? 0) + 1);
    const grade = byGrade.get(student.grade) ?? {
      students: 0,
      benchmarkRung: student.benchmarkRung,
      atOrAbove: 0,
    };
    grade.students += 1;
    if (student.benchmarkRung !== null && student.rung >= student.benchmarkRung)
      grade.atOrAbove += 1;
    byGrade.set(student.grade, grade);
  }
  const grades = [...byGrade.entries()]
    .sort(([first], [second]) => first - second)
    .map(([grade, figures]) => ({
      grade,
      ...figures,
      share: figures.benchmarkRung === null ? null : figures.atOrAbove / figures.students,
    }));
  const benchmarked = grades.filter((grade) => grade.benchmarkRung !== null);
  const students = benchmarked.reduce((sum, grade) => sum + grade.students, 0);
  const atOrAbove = benchmarked.reduce((sum, grade) => sum + grade.atOrAbove, 0);
  return {
    available: true,
    byRung: [...byRung.entries()]
      .sort(([first], [second]) => first - second)
      .map(([rung, count]) => ({ rung, students: count })),
    byGrade: grades,
    share: students ? atOrAbove / students : null,
  };
}

function daysBefore(day: string, days: number): string {
  const date = new Date(`${day}T00:00:00Z`);
  date.setUTCDate(date.getUTCDate() - days);
  return date.toISOString().slice(0, 10);
}

function withoutId({ id: _id, ...student }: StudentStanding): ReportStudent {
  return student;
}

/** Active students with no pass-off heard in the last `stalledDays` days of the period. */
export function stalledSection(
  standings: StudentStanding[] | null,
  to: string,
): DirectorReportData['stalled'] {
  if (!standings) return notAvailable('Pass-offs');
  const since = daysBefore(to, stalledDays - 1);
  return {
    available: true,
    rule: `No pass-off heard from ${since} to ${to} (${stalledDays} days); never heard counts too.`,
    students: standings
      .filter((student) => student.lastPassOffOn === null || student.lastPassOffOn < since)
      .map(withoutId),
  };
}

/** Students two or more rungs above their grade's benchmark. */
export function auditionReadySection(
  standings: StudentStanding[] | null,
): DirectorReportData['auditionReady'] {
  if (!standings) return notAvailable('Ladder standings');
  return {
    available: true,
    rule: `At least ${auditionRungsAboveBenchmark} rungs above the benchmark for their grade.`,
    students: standings
      .filter(
        (student) =>
          student.benchmarkRung !== null &&
          student.rung >= student.benchmarkRung + auditionRungsAboveBenchmark,
      )
      .sort((first, second) => second.rung - first.rung || first.name.localeCompare(second.name))
      .map(withoutId),
  };
}

/** Pass-offs heard at the school in the period, with each hearing listed. */
export async function passOffSection(
  db: Queryable,
  schoolId: number,
  from: string,
  to: string,
): Promise<DirectorReportData['passOffs']> {
  if (!(await tablesExist(db, 'pass_offs'))) return notAvailable('Pass-offs');
  const rows = rowsOf<{
    heardOn: string;
    studentNumber: string;
    name: string;
    requirementCode: string;
    tempo: number;
    passed: boolean;
    studentId: number;
  }>(
    await db.execute(sql`
      select to_char(p.heard_on, 'YYYY-MM-DD') as "heardOn", s.student_number as "studentNumber",
        coalesce(nullif(s.preferred_name, ''), s.first_name) || ' ' || s.last_name as name,
        p.requirement_code as "requirementCode", p.tempo::int as tempo, p.passed,
        p.student_id as "studentId"
      from pass_offs p join students s on s.id = p.student_id
      where p.school_id = ${schoolId} and p.heard_on between ${from}::date and ${to}::date
      order by p.heard_on, s.last_name, s.first_name, p.id`),
  );
  return {
    available: true,
    heard: rows.length,
    passed: rows.filter((row) => row.passed).length,
    students: new Set(rows.map((row) => row.studentId)).size,
    rows: rows.map(({ studentId: _studentId, ...row }) => row),
  };
}
