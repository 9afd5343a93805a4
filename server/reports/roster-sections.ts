import { sql } from 'drizzle-orm';
import { rowsOf, oneByOne } from '../db/client';
import { instruments } from '@shared/music/index';
import type { DirectorReportData } from '@shared/api/report';
import type { Queryable } from './report-tables';

const currentYear = sql`(select y.id from school_years y order by y.current desc, y.starts_on desc limit 1)`;

const instrumentNames = new Map(instruments.map((instrument) => [instrument.id, instrument.name]));

/** The instrument's usual name, for an instrument id of the music engine. */
export function instrumentName(id: string | null): string {
  if (!id) return 'No instrument given';
  return instrumentNames.get(id) ?? id;
}

/** Active students of the school, and this school year's seats by ensemble and by instrument. */
export async function enrolmentSection(
  db: Queryable,
  schoolId: number,
): Promise<DirectorReportData['enrolment']> {
  const [totals, byEnsemble, byInstrument] = await oneByOne(
    () =>
      db.execute(sql`select count(*)::int as students from students s
      where s.school_id = ${schoolId} and s.status = 'active'`),
    () =>
      db.execute(sql`
      select e.name as label,
        (select count(distinct en.student_id)::int from enrollments en
          join students s on s.id = en.student_id and s.status = 'active'
          where en.ensemble_id = e.id and en.active and en.school_year_id = ${currentYear}) as students
      from ensembles e where e.school_id = ${schoolId}
      order by e.name`),
    () =>
      db.execute(sql`
      select en.instrument_id as instrument, count(distinct en.student_id)::int as students
      from enrollments en
      join ensembles e on e.id = en.ensemble_id
      join students s on s.id = en.student_id and s.status = 'active'
      where e.school_id = ${schoolId} and en.active and en.school_year_id = ${currentYear}
      group by en.instrument_id`),
  );
  return {
    students: rowsOf<{ students: number }>(totals)[0]?.students ?? 0,
    byEnsemble: rowsOf<{ label: string; students: number }>(byEnsemble),
    byInstrument: rowsOf<{ instrument: string | null; students: number }>(byInstrument)
      .map((row) => ({ label: instrumentName(row.instrument), students: row.students }))
      .sort(
        (first, second) =>
          second.students - first.students || first.label.localeCompare(second.label),
      ),
  };
}
