import { sql } from 'drizzle-orm';
import type { Overview } from '@shared/api/analytics';
import { benchmarksInForce, type Benchmark } from '@shared/ladder/index';
import { intArray, rowsOf } from '../db/client';
import type { Queryable } from '../ladder/ladder-queries';
import type { Actor } from '../core/policy';
import { studentCondition, studentsDrill, type StudentFilters } from './analytics-scope';

/** How many active students of one school and grade stand on one rung. */
export interface HistogramCell {
  schoolId: number;
  grade: number;
  rung: number;
  students: number;
}

/**
 * The one aggregate behind four Overview figures: active students counted by school, grade and
 * rung, read from the attainment summary (one row per student), never from the pass-offs.
 */
export function histogramSql(actor: Actor, filters: StudentFilters) {
  return sql`
    select a.school_id as "schoolId", a.grade::int as grade, a.rung::int as rung, count(*)::int as students
    from student_attainment a
    where ${studentCondition(actor, filters)}
    group by 1, 2, 3`;
}

/** Runs the histogram query. */
export async function rungHistogram(
  db: Queryable,
  actor: Actor,
  filters: StudentFilters,
): Promise<HistogramCell[]> {
  return rowsOf<HistogramCell>(await db.execute(histogramSql(actor, filters)));
}

function median(counts: readonly number[]): number {
  const total = counts.reduce((sum, value) => sum + value, 0);
  const valueAt = (position: number) => {
    let seen = 0;
    for (let rung = 0; rung < counts.length; rung += 1) {
      seen += counts[rung]!;
      if (position < seen) return rung;
    }
    return counts.length - 1;
  };
  // The middle value, or the mean of the two middle values (as percentile_cont(0.5)).
  return total % 2 === 1
    ? valueAt((total - 1) / 2)
    : (valueAt(total / 2 - 1) + valueAt(total / 2)) / 2;
}

const share = (part: number, whole: number) => (whole === 0 ? null : part / whole);

/** The cells' students by rung, overall and per school and per grade. */
function tallyCells(cells: readonly HistogramCell[], width: number) {
  const emptyCounts = () => new Array<number>(width).fill(0);
  const byRung = emptyCounts();
  const bySchool = new Map<number, number[]>();
  const byGrade = new Map<number, number[]>();
  for (const cell of cells) {
    byRung[cell.rung]! += cell.students;
    const school = bySchool.get(cell.schoolId) ?? emptyCounts();
    school[cell.rung]! += cell.students;
    bySchool.set(cell.schoolId, school);
    const grade = byGrade.get(cell.grade) ?? emptyCounts();
    grade[cell.rung]! += cell.students;
    byGrade.set(cell.grade, grade);
  }
  return { byRung, bySchool, byGrade };
}

/** Each school's students at or above their grade's benchmark in force. */
function schoolBenchmarks(
  schoolRows: { id: number; code: string; name: string }[],
  cells: readonly HistogramCell[],
  inForce: ReturnType<typeof benchmarksInForce>,
  filters: StudentFilters & { asOf?: string | undefined },
) {
  return schoolRows.map((school) => {
    let atOrAbove = 0;
    let students = 0;
    for (const cell of cells) {
      if (cell.schoolId !== school.id) continue;
      const benchmark = inForce.get(cell.grade);
      if (!benchmark) continue;
      students += cell.students;
      if (cell.rung >= benchmark.rung) atOrAbove += cell.students;
    }
    return {
      schoolId: school.id,
      code: school.code,
      name: school.name,
      atOrAbove,
      students,
      share: share(atOrAbove, students),
      drill: studentsDrill({ ...filters, schoolId: school.id }, { belowBenchmark: true }),
    };
  });
}

/** The rung, benchmark and median figures from the histogram. */
export async function rungFigures(
  db: Queryable,
  cells: readonly HistogramCell[],
  rungCount: number,
  benchmarks: readonly Benchmark[],
  filters: StudentFilters & { asOf?: string | undefined },
  asOf: string,
): Promise<Pick<Overview, 'studentsByRung' | 'benchmark' | 'medianRungByGrade' | 'studentCount'>> {
  const width = Math.max(rungCount, ...cells.map((cell) => cell.rung)) + 1;
  const { byRung, bySchool, byGrade } = tallyCells(cells, width);
  const schoolIds = [...bySchool.keys()];
  const schoolRows = schoolIds.length
    ? rowsOf<{ id: number; code: string; name: string }>(
        await db.execute(
          sql`select id, code, name from schools where id = any(${intArray(schoolIds)}::int[]) order by code`,
        ),
      )
    : [];
  const inForce = benchmarksInForce(benchmarks, asOf);
  const grades = [...byGrade.keys()].sort((first, second) => first - second);

  const benchmarkByGrade = grades.flatMap((grade) => {
    const benchmark = inForce.get(grade);
    if (!benchmark) return [];
    const counts = byGrade.get(grade)!;
    const students = counts.reduce((sum, value) => sum + value, 0);
    const atOrAbove = counts.slice(benchmark.rung).reduce((sum, value) => sum + value, 0);
    return [
      {
        grade,
        rung: benchmark.rung,
        byDate: benchmark.byDate,
        atOrAbove,
        students,
        share: share(atOrAbove, students),
        drill: studentsDrill({ ...filters, grade }, { belowBenchmark: true }),
      },
    ];
  });
  const benchmarkBySchool = schoolBenchmarks(schoolRows, cells, inForce, filters);

  return {
    studentCount: byRung.reduce((sum, value) => sum + value, 0),
    studentsByRung: {
      rungs: byRung.map((students, rung) => ({
        rung,
        students,
        drill: studentsDrill(filters, { rung }),
      })),
      bySchool: schoolRows.map((school) => ({
        schoolId: school.id,
        code: school.code,
        name: school.name,
        counts: bySchool.get(school.id)!,
        drill: studentsDrill({ ...filters, schoolId: school.id }, {}),
      })),
      byGrade: grades.map((grade) => ({
        grade,
        counts: byGrade.get(grade)!,
        drill: studentsDrill({ ...filters, grade }, {}),
      })),
    },
    benchmark: { byGrade: benchmarkByGrade, bySchool: benchmarkBySchool },
    medianRungByGrade: grades.map((grade) => {
      const counts = byGrade.get(grade)!;
      return {
        grade,
        median: median(counts),
        students: counts.reduce((sum, value) => sum + value, 0),
        drill: studentsDrill({ ...filters, grade }, {}),
      };
    }),
  };
}
