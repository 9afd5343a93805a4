import { sql, type SQL } from 'drizzle-orm';
import { rowsOf, yieldToRequests, type Database } from '../db/client';

/** A student as the database holds it, with the fields an import compares. */
export interface ExistingStudent {
  id: number;
  studentNumber: string;
  firstName: string;
  lastName: string;
  preferredName: string | null;
  grade: number;
  schoolId: number;
  status: 'active' | 'withdrawn' | 'graduated' | 'leaving';
  guardianName: string | null;
  guardianEmail: string | null;
}

/** A seat of the current school year. */
export interface ExistingSeat {
  instrumentId: string | null;
  active: boolean;
}

/** The part of the database an import is compared against, read in a few set-based queries. */
export interface RosterSnapshot {
  schoolYear: { id: number; name: string } | null;
  schoolIdByCode: Map<string, number>;
  schoolCodeById: Map<number, string>;
  /** The file's students and, when asked, every student of the file's schools; by student id. */
  students: Map<string, ExistingStudent>;
  /** Each school's ensembles by name in lower case. */
  ensembles: Map<number, Map<string, { id: number; name: string }>>;
  /** Current-year seats of the file's students: student id → ensemble id → seat. */
  seats: Map<string, Map<number, ExistingSeat>>;
  /**
   * The roster generation (migration 0013) the reads saw from first to last; null when a write
   * moved it while they ran, so the snapshot may mix before and after.
   */
  generation: string | null;
}

/** The roster generation: it moves with every statement that writes what an import compares. */
export async function rosterGeneration(
  query: (text: string) => Promise<{ last_value: string | number; is_called: boolean }[]>,
): Promise<string> {
  const [row] = await query('select last_value, is_called from roster_generation');
  return row!.is_called ? String(row!.last_value) : '0';
}

/**
 * The rows of a query, fetched as one JSON text: PGlite decodes a result row by row in
 * JavaScript, which for tens of thousands of rows costs far more than the query itself.
 */
export async function jsonRows<Row>(db: Database, query: SQL): Promise<Row[]> {
  const [row] = rowsOf<{ json: string }>(
    await db.execute(sql`select coalesce(json_agg(q), '[]')::text as json from (${query}) q`),
  );
  return JSON.parse(row!.json) as Row[];
}

/** The district's school codes, which a roster's rows must name. */
export async function districtSchoolCodes(db: Database): Promise<Set<string>> {
  const rows = rowsOf<{ code: string }>(await db.execute(sql`select code from schools`));
  return new Set(rows.map((row) => row.code));
}

/** The fields an import compares, of `students s`, named as `ExistingStudent` names them. */
const existingStudentColumns = sql`s.id, s.student_number as "studentNumber",
  s.first_name as "firstName", s.last_name as "lastName", s.preferred_name as "preferredName",
  s.grade, s.school_id as "schoolId", s.status, s.guardian_name as "guardianName",
  s.guardian_email as "guardianEmail"`;

/**
 * Students read per statement. Measured on a 50,000-student district: the 20,000 students of a
 * file in one statement took ~140 ms, in slices of 4,000 about 30 ms each.
 */
export const snapshotSlice = 4_000;

/**
 * Every student of the file's schools, for withdrawing those the file leaves out: in slices by
 * id.
 */
async function schoolsStudents(db: Database, schoolIds: number[]): Promise<ExistingStudent[]> {
  const studentRows: ExistingStudent[] = [];
  for (let after = 0; schoolIds.length > 0;) {
    const slice = await jsonRows<ExistingStudent>(
      db,
      sql`select ${existingStudentColumns} from students s
        where s.school_id = any(${sql.param(schoolIds)}::int[]) and s.id > ${after}
        order by s.id limit ${snapshotSlice}`,
    );
    studentRows.push(...slice);
    if (slice.length < snapshotSlice) break;
    after = slice.at(-1)!.id;
    await yieldToRequests();
  }
  return studentRows;
}

/** Each school's ensembles by name in lower case; the first of a name (lowest id) wins. */
function ensemblesBySchool(
  rows: { id: number; schoolId: number; name: string }[],
): RosterSnapshot['ensembles'] {
  const ensembles: RosterSnapshot['ensembles'] = new Map();
  for (const row of rows) {
    const byName = ensembles.get(row.schoolId) ?? new Map();
    const key = row.name.toLowerCase();
    if (!byName.has(key)) byName.set(key, { id: row.id, name: row.name });
    ensembles.set(row.schoolId, byName);
  }
  return ensembles;
}

/** Reads what an import of these students at these schools is compared against. */
export async function readRosterSnapshot(
  db: Database,
  studentNumbers: string[],
  schoolCodes: string[],
  withSchoolsStudents: boolean,
): Promise<RosterSnapshot> {
  const generationNow = () =>
    rosterGeneration(async (text) =>
      rowsOf<{ last_value: string | number; is_called: boolean }>(await db.execute(sql.raw(text))),
    );
  const generationBefore = await generationNow();
  const schools = rowsOf<{ id: number; code: string }>(
    await db.execute(sql`select id, code from schools`),
  );
  const schoolIdByCode = new Map(schools.map((school) => [school.code, school.id]));
  const schoolCodeById = new Map(schools.map((school) => [school.id, school.code]));
  const schoolIds = schoolCodes.flatMap((code) => schoolIdByCode.get(code) ?? []);
  const [year] = rowsOf<{ id: number; name: string }>(
    await db.execute(
      sql`select id, name from school_years where current order by starts_on desc limit 1`,
    ),
  );
  const studentRows: ExistingStudent[] = [];
  const seatRows: (ExistingSeat & { studentNumber: string; ensembleId: number })[] = [];
  // In slices of the file, each its own statement: the embedded engine runs one statement at a
  // time, and pages waiting behind a 20,000-student read had waited ~140 ms (see snapshotSlice).
  for (let from = 0; from < studentNumbers.length; from += snapshotSlice) {
    if (from > 0) await yieldToRequests();
    const numbers = sql.param(studentNumbers.slice(from, from + snapshotSlice));
    studentRows.push(
      ...(await jsonRows<ExistingStudent>(
        db,
        sql`select ${existingStudentColumns} from students s
          join unnest(${numbers}::text[]) as listed (number) on listed.number = s.student_number`,
      )),
    );
    if (year)
      seatRows.push(
        ...(await jsonRows<ExistingSeat & { studentNumber: string; ensembleId: number }>(
          db,
          sql`
            select s.student_number as "studentNumber", en.ensemble_id as "ensembleId",
              en.instrument_id as "instrumentId", en.active
            from enrollments en join students s on s.id = en.student_id
              join unnest(${numbers}::text[]) as listed (number) on listed.number = s.student_number
            where en.school_year_id = ${year.id}`,
        )),
      );
  }
  if (withSchoolsStudents) studentRows.push(...(await schoolsStudents(db, schoolIds)));
  const ensembleRows = rowsOf<{ id: number; schoolId: number; name: string }>(
    await db.execute(sql`
      select id, school_id as "schoolId", name from ensembles
      where school_id = any(${sql.param(schoolIds)}::int[]) order by id`),
  );
  const ensembles = ensemblesBySchool(ensembleRows);
  const generationAfter = await generationNow();
  const seats = new Map<string, Map<number, ExistingSeat>>();
  for (const row of seatRows) {
    const byEnsemble = seats.get(row.studentNumber) ?? new Map<number, ExistingSeat>();
    byEnsemble.set(row.ensembleId, { instrumentId: row.instrumentId, active: row.active });
    seats.set(row.studentNumber, byEnsemble);
  }
  return {
    schoolYear: year ?? null,
    schoolIdByCode,
    schoolCodeById,
    students: new Map(studentRows.map((row) => [row.studentNumber, row])),
    ensembles,
    seats,
    generation: generationBefore === generationAfter ? generationBefore : null,
  };
}
