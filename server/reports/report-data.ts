import { oneByOne } from '../db/client';
import { asc, desc, eq } from 'drizzle-orm';
import { reportRuns, schools } from '../db/schema/index';
import type { DirectorReportData, DistrictReportData, ReportFigures } from '@shared/api/report';
import { notFound } from '../core/errors';
import { enrolmentSection } from './roster-sections';
import {
  auditionReadySection,
  ladderSection,
  passOffSection,
  stalledSection,
  studentStandings,
} from './ladder-sections';
import { fleetSection } from './fleet-sections';
import type { Queryable } from './report-tables';

/** Everything one school's director report shows, section by section. */
export async function assembleDirectorReport(
  db: Queryable,
  schoolId: number,
  from: string,
  to: string,
): Promise<DirectorReportData> {
  const [school] = await db
    .select({ id: schools.id, code: schools.code, name: schools.name })
    .from(schools)
    .where(eq(schools.id, schoolId));
  if (!school) throw notFound('That school');
  const [enrolment, standings, passOffs, fleet] = await oneByOne(
    () => enrolmentSection(db, schoolId),
    () => studentStandings(db, schoolId, to),
    () => passOffSection(db, schoolId, from, to),
    () => fleetSection(db, schoolId, to),
  );
  return {
    kind: 'director',
    school,
    from,
    to,
    enrolment,
    ladder: ladderSection(standings),
    passOffs,
    stalled: stalledSection(standings, to),
    auditionReady: auditionReadySection(standings),
    fleet,
  };
}

/** The headline figures of a director report, as the district summary compares them. */
export function figuresOf(report: DirectorReportData): ReportFigures {
  const { ladder, passOffs, stalled, auditionReady, fleet } = report;
  return {
    students: report.enrolment.students,
    atOrAboveShare: ladder.available ? ladder.share : null,
    passOffsHeard: passOffs.available ? passOffs.heard : null,
    passOffsPassed: passOffs.available ? passOffs.passed : null,
    stalled: stalled.available ? stalled.students.length : null,
    auditionReady: auditionReady.available ? auditionReady.students.length : null,
    instrumentsOut: fleet.available ? fleet.out : null,
    overdue: fleet.available ? fleet.overdue : null,
    inRepair: fleet.available ? fleet.inRepair : null,
    unsigned: fleet.available ? fleet.unsigned : null,
  };
}

function districtTotals(reports: DirectorReportData[]): ReportFigures {
  const figures = reports.map(figuresOf);
  const sum = (field: Exclude<keyof ReportFigures, 'atOrAboveShare'>): number | null => {
    const known = figures.map((each) => each[field]).filter((value) => value !== null);
    return known.length ? known.reduce((total, value) => total + value, 0) : null;
  };
  // The district share weighs each school by its students with a benchmark, not by school.
  let benchmarked = 0;
  let atOrAbove = 0;
  for (const report of reports) {
    if (!report.ladder.available) continue;
    for (const grade of report.ladder.byGrade) {
      if (grade.benchmarkRung === null) continue;
      benchmarked += grade.students;
      atOrAbove += grade.atOrAbove;
    }
  }
  return {
    students: sum('students') ?? 0,
    atOrAboveShare: benchmarked ? atOrAbove / benchmarked : null,
    passOffsHeard: sum('passOffsHeard'),
    passOffsPassed: sum('passOffsPassed'),
    stalled: sum('stalled'),
    auditionReady: sum('auditionReady'),
    instrumentsOut: sum('instrumentsOut'),
    overdue: sum('overdue'),
    inRepair: sum('inRepair'),
    unsigned: sum('unsigned'),
  };
}

/** The district summary: every school side by side, the totals, and the last summary's totals. */
export async function assembleDistrictReport(
  db: Queryable,
  from: string,
  to: string,
): Promise<DistrictReportData> {
  const schoolRows = await db
    .select({ id: schools.id, code: schools.code, name: schools.name })
    .from(schools)
    .orderBy(asc(schools.code));
  const reports: DirectorReportData[] = [];
  for (const school of schoolRows)
    reports.push(await assembleDirectorReport(db, school.id, from, to));
  const [previous] = await db
    .select()
    .from(reportRuns)
    .where(eq(reportRuns.kind, 'district'))
    .orderBy(desc(reportRuns.createdAt), desc(reportRuns.id))
    .limit(1);
  const previousFigures = previous?.figures as { totals?: ReportFigures } | undefined;
  return {
    kind: 'district',
    from,
    to,
    schools: reports.map((report) => ({ ...report.school, figures: figuresOf(report) })),
    totals: districtTotals(reports),
    previous:
      previous && previousFigures?.totals
        ? {
            sentAt: previous.createdAt.toISOString(),
            from: previous.periodFrom,
            to: previous.periodTo,
            totals: previousFigures.totals,
          }
        : null,
  };
}
