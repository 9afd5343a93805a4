import { sql } from 'drizzle-orm';
import { rowsOf, oneByOne } from '../db/client';
import type { DirectorReportData } from '@shared/api/report';
import { notAvailable, tablesExist, type Queryable } from './report-tables';
import { instrumentName } from './roster-sections';

/**
 * The school's instruments out on loan, overdue on the period's last day, in repair, and loans
 * whose guardian agreement is still unsigned.
 */
export async function fleetSection(
  db: Queryable,
  schoolId: number,
  to: string,
): Promise<DirectorReportData['fleet']> {
  if (!(await tablesExist(db, 'instruments', 'loans'))) return notAvailable('Instrument loans');
  const [loanRows, repairRows] = await oneByOne(
    () =>
      db.execute(sql`
      select i.asset_tag as "assetTag", i.instrument_id as "instrumentType",
        s.student_number as "studentNumber",
        coalesce(nullif(s.preferred_name, ''), s.first_name) || ' ' || s.last_name as student,
        to_char(l.checked_out_on, 'YYYY-MM-DD') as "checkedOutOn",
        to_char(l.due_on, 'YYYY-MM-DD') as "dueOn",
        (l.due_on < ${to}::date) as overdue, (l.signed_at is not null) as signed
      from loans l
      join instruments i on i.id = l.instrument_id
      join students s on s.id = l.student_id
      where l.school_id = ${schoolId} and l.state = 'active'
      order by l.due_on, i.asset_tag`),
    () =>
      db.execute(sql`select count(*)::int as count from instruments i
      where i.home_school_id = ${schoolId} and i.status = 'in-repair'`),
  );
  const loans = rowsOf<{
    assetTag: string;
    instrumentType: string;
    studentNumber: string;
    student: string;
    checkedOutOn: string;
    dueOn: string;
    overdue: boolean;
    signed: boolean;
  }>(loanRows).map(({ instrumentType, ...loan }) => ({
    ...loan,
    instrument: instrumentName(instrumentType),
  }));
  return {
    available: true,
    out: loans.length,
    overdue: loans.filter((loan) => loan.overdue).length,
    inRepair: rowsOf<{ count: number }>(repairRows)[0]?.count ?? 0,
    unsigned: loans.filter((loan) => !loan.signed).length,
    loans,
  };
}
