import { rowsOf, type DatabaseHandle } from '../../server/db/client';

/** What the roster holds before a start, read plainly, row by row. */
export interface RosterBefore {
  currentYear: { id: number; endsOn: string };
  schools: {
    id: number;
    code: string;
    highest: number | null;
    sendsTo: number | null;
    closedOn: string | null;
  }[];
  students: { id: number; schoolId: number; grade: number; status: string }[];
  seats: {
    studentId: number;
    ensembleId: number;
    ensembleSchoolId: number;
    yearId: number;
    active: boolean;
  }[];
  ensembles: { id: number; schoolId: number }[];
  loans: { id: number; state: string; dueOn: string }[];
}

/** Reads the tables a start works from, with no aggregation. */
export async function readRosterBefore(database: DatabaseHandle): Promise<RosterBefore> {
  const query = async <Row>(text: string) => rowsOf<Row>(await database.db.execute(text as never));
  const [currentYear] = await query<{ id: number; endsOn: string }>(
    `select id, to_char(ends_on, 'YYYY-MM-DD') as "endsOn" from school_years where current`,
  );
  return {
    currentYear: currentYear!,
    schools: await query(
      `select id, code, highest_grade as highest, sends_to_school_id as "sendsTo", to_char(closed_on, 'YYYY-MM-DD') as "closedOn" from schools`,
    ),
    students: await query(`select id, school_id as "schoolId", grade, status from students`),
    seats: await query(
      `select en.student_id as "studentId", en.ensemble_id as "ensembleId", e.school_id as "ensembleSchoolId", en.school_year_id as "yearId", en.active from enrollments en join ensembles e on e.id = en.ensemble_id`,
    ),
    ensembles: await query(`select id, school_id as "schoolId" from ensembles`),
    loans: await query(`select id, state, to_char(due_on, 'YYYY-MM-DD') as "dueOn" from loans`),
  };
}

export type Outcome = 'promoted' | 'graduated' | 'moving-up' | 'leaving';

/**
 * The start computed plainly in JavaScript, one student at a time, from the rules: grade 12
 * graduates; the last grade a school serves (or a school closed by the first day) moves up to
 * the school it sends to, or leaves when there is none open; everyone else goes up a grade.
 */
export function expectedStart(before: RosterBefore, startsOn: string, emptyEnsembles = false) {
  const schoolById = new Map(before.schools.map((school) => [school.id, school]));
  const open = (id: number | null) => {
    const school = id === null ? undefined : schoolById.get(id);
    return school !== undefined && (school.closedOn === null || school.closedOn > startsOn);
  };
  const studentById = new Map(before.students.map((student) => [student.id, student]));
  const outcomes = new Map<
    number,
    { outcome: Outcome; schoolId: number; grade: number; status: string }
  >();
  for (const student of before.students) {
    if (student.status !== 'active') continue;
    const school = schoolById.get(student.schoolId)!;
    let outcome: Outcome;
    if (student.grade >= 12) outcome = 'graduated';
    else if (
      (school.highest !== null && student.grade >= school.highest) ||
      (school.closedOn !== null && school.closedOn <= startsOn)
    )
      outcome = open(school.sendsTo) ? 'moving-up' : 'leaving';
    else outcome = 'promoted';
    outcomes.set(student.id, {
      outcome,
      schoolId: outcome === 'moving-up' ? school.sendsTo! : student.schoolId,
      grade: outcome === 'promoted' || outcome === 'moving-up' ? student.grade + 1 : student.grade,
      status: outcome === 'graduated' ? 'graduated' : outcome === 'leaving' ? 'leaving' : 'active',
    });
  }
  const carriedSeats = emptyEnsembles
    ? []
    : before.seats.filter((seat) => {
        const planned = outcomes.get(seat.studentId);
        const student = studentById.get(seat.studentId);
        return (
          planned?.outcome === 'promoted' &&
          seat.yearId === before.currentYear.id &&
          seat.active &&
          seat.ensembleSchoolId === student!.schoolId
        );
      });
  const count = (outcome: Outcome) =>
    [...outcomes.values()].filter((row) => row.outcome === outcome).length;
  const openLoans = before.loans.filter((loan) => loan.state === 'active');
  return {
    outcomes,
    carriedSeats,
    counts: {
      students: outcomes.size,
      promoted: count('promoted'),
      graduated: count('graduated'),
      movingUp: count('moving-up'),
      leaving: count('leaving'),
      ensembles: before.ensembles.filter((ensemble) => open(ensemble.schoolId)).length,
      seats: carriedSeats.length,
      loansCarried: openLoans.length,
      loansDueBack: openLoans.filter((loan) => loan.dueOn <= before.currentYear.endsOn).length,
    },
  };
}

/** A seat as (student, ensemble), the shape `seatsOfYear` reads and `carriedSeatPairs` plans. */
export interface SeatPair {
  student_id: number;
  ensemble_id: number;
}

/** The seats of the school year named `yearName`, sorted by student then ensemble. */
export async function seatsOfYear(database: DatabaseHandle, yearName: string): Promise<SeatPair[]> {
  return rowsOf<SeatPair>(
    await database.db.execute(
      `select student_id, ensemble_id from enrollments en join school_years y on y.id = en.school_year_id where y.name = '${yearName}' order by 1, 2` as never,
    ),
  );
}

/** The seats the plain computation carries into the new year, in `seatsOfYear`'s order. */
export function carriedSeatPairs(expected: ReturnType<typeof expectedStart>): SeatPair[] {
  return expected.carriedSeats
    .map((seat) => ({ student_id: seat.studentId, ensemble_id: seat.ensembleId }))
    .sort((a, b) => a.student_id - b.student_id || a.ensemble_id - b.ensemble_id);
}
