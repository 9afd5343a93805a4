import { and, eq, sql, type SQL } from 'drizzle-orm';
import { intArray, type Database, type Transaction } from '../db/client';
import { enrollments, ensembles } from '../db/schema/index';
import { instrumentName, scorePosition } from '../enrollments/instrument-order';

/** What the student list shows of a student's current seats. */
export interface SeatSummary {
  ensembles: string;
  ensembleIds: number[];
  instruments: string;
  instrumentIds: string[];
}

const noSeats: SeatSummary = { ensembles: '', ensembleIds: [], instruments: '', instrumentIds: [] };

/**
 * The current ensembles and instruments of just these students, in one query over their ids
 * (the page's rows), so a page never joins the whole enrollment table. The school year is an id,
 * or a subquery that answers one (`currentSchoolYearId`).
 */
export async function seatSummaries(
  db: Database | Transaction,
  studentIds: number[],
  schoolYearId: number | SQL<number | null> | undefined,
): Promise<(studentId: number) => SeatSummary> {
  if (studentIds.length === 0 || schoolYearId === undefined) return () => noSeats;
  const seats = await db
    .select({
      studentId: enrollments.studentId,
      ensembleId: ensembles.id,
      ensembleName: ensembles.name,
      instrumentId: enrollments.instrumentId,
    })
    .from(enrollments)
    .innerJoin(ensembles, eq(ensembles.id, enrollments.ensembleId))
    .where(
      and(
        // One array parameter, not one per student: building a statement costs per parameter.
        sql`${enrollments.studentId} = any(${intArray(studentIds)}::int[])`,
        eq(enrollments.schoolYearId, schoolYearId),
        eq(enrollments.active, true),
      ),
    )
    .orderBy(ensembles.name, ensembles.id);
  const byStudent = new Map<number, { ensembles: Map<number, string>; instruments: Set<string> }>();
  for (const seat of seats) {
    let entry = byStudent.get(seat.studentId);
    if (!entry) {
      entry = { ensembles: new Map(), instruments: new Set() };
      byStudent.set(seat.studentId, entry);
    }
    entry.ensembles.set(seat.ensembleId, seat.ensembleName);
    if (seat.instrumentId) entry.instruments.add(seat.instrumentId);
  }
  return (studentId) => {
    const entry = byStudent.get(studentId);
    if (!entry) return noSeats;
    const instrumentIds = [...entry.instruments].sort(
      (a, b) => scorePosition(a) - scorePosition(b),
    );
    return {
      ensembles: [...entry.ensembles.values()].join(', '),
      ensembleIds: [...entry.ensembles.keys()],
      instruments: instrumentIds.map(instrumentName).join(', '),
      instrumentIds,
    };
  };
}
