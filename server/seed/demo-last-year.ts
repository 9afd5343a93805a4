import { sql } from 'drizzle-orm';
import type { Transaction } from '../db/client';
import { rowsOf } from '../db/client';
import { enrollments, schoolYears, studentYears, students } from '../db/schema/index';
import { appliesTo, currentRung, type PassOffRecord, type Rung } from '@shared/ladder/index';
import { rebuildAttainment } from '../ladder/attainment';
import { activeRuleLadder } from '../ladder/ladder-queries';
import { familyOf } from '../ladder/student-families';
import { demoSchools, firstNames, lastNames, type DemoSchoolCode } from './demo-people';
import { insertPassOffRows, targetsByGrade, weekday } from './demo-ladder';
import {
  bandInstruments,
  ensemblesByLevel,
  insertInBatches,
  stringInstruments,
} from './demo-roster';
import { SeededRandom } from './random';

/** The year before the demo's current one: ended, read-only history. */
export const demoLastSchoolYear = { name: '2025-26', startsOn: '2025-08-18', endsOn: '2026-06-12' };

/**
 * The share of last year's players who stopped at each step (invented for the demonstration):
 * most stop where they change schools, elementary to middle above all, as music programs
 * commonly report (common practice, no source).
 */
export const demoStopRates = { elementaryToMiddle: 0.3, middleToHigh: 0.24, withinSchool: 0.07 };

interface Pupil {
  id: number;
  grade: number;
  code: DemoSchoolCode;
  rung: number;
  instrument: string | null;
  ensembleId: number | null;
}

interface LastYearPlayer {
  studentId: number;
  school: DemoSchoolCode;
  grade: number;
  outcome: 'promoted' | 'moving-up' | 'graduated';
  instrument: string;
  /** The rung they reached by the year's end. */
  rung: number;
  /** Their seat: the same ensemble as now when they stayed at the school, else one picked. */
  ensembleId: number | null;
}

const dayMs = 24 * 60 * 60 * 1000;
const isoDay = (time: number) => new Date(time).toISOString().slice(0, 10);
const schoolOf = new Map(demoSchools.map((school) => [school.code, school]));
const isStringInstrument = (instrument: string) =>
  stringInstruments.some(([id]) => id === instrument);

/** Where a student now at `code` in `grade` played last year (null: they started this year). */
function lastYearSchool(random: SeededRandom, code: DemoSchoolCode, grade: number) {
  const school = schoolOf.get(code)!;
  if (grade - 1 >= school.lowestGrade) {
    // Grade 4 is where the demo's elementary program starts; some start a year later.
    if (grade - 1 < 4) return null;
    return random.chance(grade === 5 ? 0.85 : 0.93) ? code : null;
  }
  const feeders = demoSchools.filter((candidate) => candidate.sendsTo === code);
  if (feeders.length === 0 || !random.chance(0.8)) return null;
  return random.weighted(feeders.map((feeder) => [feeder.code, feeder.students] as const));
}

type SchoolIds = Map<string, number>;
type SeatAt = (code: DemoSchoolCode, grade: number, instrument: string) => number;

/** This year's active students with their school, rung and first seat. */
async function readPupils(tx: Transaction, schoolIds: SchoolIds): Promise<Pupil[]> {
  const codeOfSchool = new Map([...schoolIds].map(([code, id]) => [id, code]));
  return rowsOf<{
    id: number;
    grade: number;
    school_id: number;
    rung: number;
    instrument_id: string | null;
    ensemble_id: number | null;
  }>(
    await tx.execute(sql`
      select s.id, s.grade::int as grade, s.school_id, coalesce(a.rung, 0)::int as rung,
        seat.instrument_id, seat.ensemble_id
      from students s
      left join student_attainment a on a.student_id = s.id
      left join lateral (select e.instrument_id, e.ensemble_id from enrollments e
        where e.student_id = s.id order by e.id limit 1) seat on true
      where s.status = 'active' order by s.id`),
  ).map((row): Pupil => ({
    id: row.id,
    grade: row.grade,
    code: codeOfSchool.get(row.school_id)! as DemoSchoolCode,
    rung: row.rung,
    instrument: row.instrument_id,
    ensembleId: row.ensemble_id,
  }));
}

/** Picks an ensemble of a school for a player of that grade and instrument. */
async function seatPicker(
  tx: Transaction,
  random: SeededRandom,
  schoolIds: SchoolIds,
): Promise<SeatAt> {
  const ensembleRows = rowsOf<{ id: number; school_id: number; name: string }>(
    await tx.execute(sql`select id, school_id, name from ensembles order by id`),
  );
  return (code, grade, instrument) => {
    const school = schoolOf.get(code)!;
    const strings = isStringInstrument(instrument);
    const fitting = ensemblesByLevel[school.level]!.filter(
      (definition) =>
        definition.strings === strings &&
        (!definition.grades || definition.grades.includes(grade)) &&
        definition.kind !== 'marching-band',
    );
    const name = (fitting.length ? random.pick(fitting) : ensemblesByLevel[school.level]![0]!).name;
    return ensembleRows.find((row) => row.school_id === schoolIds.get(code) && row.name === name)!
      .id;
  };
}

/** This year's players who played last year too, and how many continued from each school and grade. */
function continuingPlayers(random: SeededRandom, pupils: Pupil[], seatAt: SeatAt) {
  const players: LastYearPlayer[] = [];
  const continuing = new Map<string, number>();
  for (const pupil of pupils) {
    if (!pupil.instrument) continue;
    const school = lastYearSchool(random, pupil.code, pupil.grade);
    if (!school) continue;
    const moved = school !== pupil.code;
    // Most of a year's climb is this year's; last year ended one or two rungs lower.
    const rung = Math.max(
      0,
      pupil.rung -
        random.weighted([
          [0, 15],
          [1, 55],
          [2, 30],
        ] as const),
    );
    players.push({
      studentId: pupil.id,
      school,
      grade: pupil.grade - 1,
      outcome: moved ? 'moving-up' : 'promoted',
      instrument: pupil.instrument,
      rung,
      ensembleId: moved ? seatAt(school, pupil.grade - 1, pupil.instrument) : pupil.ensembleId,
    });
    const key = `${school}:${pupil.grade - 1}`;
    continuing.set(key, (continuing.get(key) ?? 0) + 1);
  }

  return { players, continuing };
}

type PastOnlyStudent = typeof students.$inferInsert & {
  lastSchool: DemoSchoolCode;
  lastGrade: number;
  outcome: LastYearPlayer['outcome'];
  instrument: string;
};

/**
 * Last year's players who are not here this year: those who stopped, in proportion to those who
 * continued from the same school and grade, and last year's grade 12.
 */
function pastOnlyStudents(
  random: SeededRandom,
  pupils: Pupil[],
  continuing: Map<string, number>,
  schoolIds: SchoolIds,
): PastOnlyStudent[] {
  const pastOnly: PastOnlyStudent[] = [];
  for (const [key, count] of [...continuing].sort(([a], [b]) => a.localeCompare(b))) {
    const [code, gradeText] = key.split(':') as [DemoSchoolCode, string];
    const grade = Number(gradeText);
    const school = schoolOf.get(code)!;
    const last = grade === school.highestGrade;
    const rate = !last
      ? demoStopRates.withinSchool
      : school.level === 'elementary'
        ? demoStopRates.elementaryToMiddle
        : demoStopRates.middleToHigh;
    const stopped = Math.round((count * rate) / (1 - rate));
    for (let index = 0; index < stopped; index += 1) {
      pastOnly.push({
        ...inventedStudent(random),
        grade: grade + 1,
        schoolId: schoolIds.get(last && school.sendsTo ? school.sendsTo : code)!,
        status: 'withdrawn',
        lastSchool: code,
        lastGrade: grade,
        outcome: last ? 'moving-up' : 'promoted',
        instrument: pickInstrument(random),
      });
    }
  }
  // Last year's grade 12: about as many as this year's.
  const seniors = pupils.filter((pupil) => pupil.code === 'TRHS' && pupil.grade === 12).length;
  for (let index = 0; index < seniors; index += 1) {
    pastOnly.push({
      ...inventedStudent(random),
      grade: 12,
      schoolId: schoolIds.get('TRHS')!,
      status: 'graduated',
      lastSchool: 'TRHS',
      lastGrade: 12,
      outcome: 'graduated',
      instrument: pickInstrument(random),
    });
  }
  return pastOnly;
}

/** Writes the past-only students (withdrawn or graduated); answers their ids in order. */
async function insertPastStudents(tx: Transaction, pastOnly: PastOnlyStudent[]): Promise<number[]> {
  let studentNumber = 198_000;
  const pastIds: number[] = [];
  await insertInBatches(pastOnly, 500, async (batch) => {
    const rows = await tx
      .insert(students)
      .values(
        batch.map((student) => ({
          studentNumber: String((studentNumber += 1)),
          firstName: student.firstName,
          lastName: student.lastName,
          grade: student.grade,
          schoolId: student.schoolId,
          status: student.status,
          guardianName: student.guardianName,
          guardianEmail: `${student.guardianName!.toLowerCase().replace(/[^a-z]+/g, '.')}.${studentNumber}@families.merrowbasin.example`,
        })),
      )
      .returning({ id: students.id });
    pastIds.push(...rows.map((row) => row.id));
  });
  return pastIds;
}

/**
 * Seeds the demo's previous school year, 2025–26: the year itself (ended), where each continuing
 * student played and their seat, the students who stopped at the end of it (withdrawn since,
 * more of them where they changed schools) and the class that graduated, each with their
 * pass-offs heard that year and their rung at its end (`student_years`). It draws from its own
 * random sequence and only adds pass-offs this year's already pass again (at the slowest passing
 * tempo), so every figure of the current year reads as it did without it.
 */
export async function seedDemoLastYear(
  tx: Transaction,
  context: { schoolIds: Map<string, number>; directorOf: Map<string, number> },
) {
  const random = new SeededRandom(20250818);
  const [year] = await tx
    .insert(schoolYears)
    .values({ ...demoLastSchoolYear, current: false })
    .returning({ id: schoolYears.id });
  const ladder = (await activeRuleLadder(tx))!;
  const seatAt = await seatPicker(tx, random, context.schoolIds);
  const pupils = await readPupils(tx, context.schoolIds);
  const { players, continuing } = continuingPlayers(random, pupils, seatAt);
  const pastOnly = pastOnlyStudents(random, pupils, continuing, context.schoolIds);
  const pastIds = await insertPastStudents(tx, pastOnly);
  pastOnly.forEach((student, index) => {
    const weights = targetsByGrade[student.lastGrade] ?? [[0, 1]];
    players.push({
      studentId: pastIds[index]!,
      school: student.lastSchool,
      grade: student.lastGrade,
      outcome: student.outcome,
      instrument: student.instrument,
      rung: Math.max(0, random.weighted(weights) + 1),
      ensembleId: seatAt(student.lastSchool, student.lastGrade, student.instrument),
    });
  });

  await insertInBatches(players, 500, (batch) =>
    tx.insert(enrollments).values(
      batch
        .filter((player) => player.ensembleId !== null)
        .map((player, position) => ({
          studentId: player.studentId,
          ensembleId: player.ensembleId!,
          schoolYearId: year!.id,
          instrumentId: player.instrument,
          part: '',
          chair: (position % 6) + 1,
          active: true,
        })),
    ),
  );
  const history = await seedLastYearPassOffs(tx, random, ladder, players, context);
  await insertInBatches(players, 1000, (batch) =>
    tx.insert(studentYears).values(
      batch.map((player) => ({
        studentId: player.studentId,
        schoolYearId: year!.id,
        schoolId: context.schoolIds.get(player.school)!,
        grade: player.grade,
        outcome: player.outcome,
        rung: history.get(player.studentId) ?? 0,
      })),
    ),
  );
  await rebuildAttainment(tx);
  // Each player's cohort, the cohorts' rungs at the closed year's end and the history's rung
  // dates, as a year start writes them.
  await tx.execute(sql`select refresh_history_summaries()`);
}

const guardianFirstNames = ['Alex', 'Sam', 'Jordan', 'Morgan', 'Casey', 'Robin', 'Taylor', 'Jamie'];

function inventedStudent(random: SeededRandom) {
  const lastName = random.pick(lastNames);
  return {
    studentNumber: '',
    firstName: random.pick(firstNames),
    lastName,
    guardianName: `${random.pick(guardianFirstNames)} ${lastName}`,
  };
}

function pickInstrument(random: SeededRandom): string {
  return random.chance(0.32)
    ? random.weighted(stringInstruments)
    : random.weighted(bandInstruments);
}

/**
 * Last year's pass-offs: every requirement of the rungs each player reached, passed at exactly
 * its tempo, spread over the school days of the year and heard by the school's director, with a
 * few "not yet" attempts before. Answers each player's rung at the year's end under the rules.
 */
async function seedLastYearPassOffs(
  tx: Transaction,
  random: SeededRandom,
  ladder: { versionId: number; rungs: Rung[] },
  players: LastYearPlayer[],
  context: { schoolIds: Map<string, number>; directorOf: Map<string, number> },
): Promise<Map<number, number>> {
  const requirementIds = new Map(
    rowsOf<{ id: number; code: string }>(
      await tx.execute(
        sql`select id, code from ladder_requirements where ladder_version_id = ${ladder.versionId}`,
      ),
    ).map((row) => [row.code, row.id]),
  );
  const first = Date.parse('2025-08-25T00:00:00Z');
  const last = Date.parse('2026-06-05T00:00:00Z');
  const rows: Record<string, unknown>[] = [];
  const rungs = new Map<number, number>();
  for (const player of players) {
    const family = familyOf(player.instrument);
    const events: { code: string; tempo: number; passed: boolean }[] = [];
    for (const rung of ladder.rungs) {
      if (rung.number > player.rung) break;
      for (const requirement of rung.requirements) {
        if (requirement.optional || !appliesTo(requirement, family)) continue;
        if (random.chance(0.2))
          events.push({ code: requirement.id, tempo: requirement.tempo - 8, passed: false });
        events.push({ code: requirement.id, tempo: requirement.tempo, passed: true });
      }
    }
    const records: PassOffRecord[] = events.map((event) => ({
      requirementId: event.code,
      tempo: event.tempo,
      passed: event.passed,
      heardOn: '',
    }));
    rungs.set(player.studentId, currentRung(ladder.rungs, records, family));
    const start = first + random.integer(0, 10) * dayMs;
    const end = last - random.integer(0, 20) * dayMs;
    events.forEach((event, index) => {
      rows.push({
        studentId: player.studentId,
        schoolId: context.schoolIds.get(player.school)!,
        grade: player.grade,
        ladderVersionId: ladder.versionId,
        requirementId: requirementIds.get(event.code)!,
        requirementCode: event.code,
        heardOn: isoDay(
          weekday(
            start + Math.round(((end - start) * (index + 1)) / events.length / dayMs) * dayMs,
            last,
          ),
        ),
        tempo: event.tempo,
        passed: event.passed,
        heardBy: context.directorOf.get(player.school) ?? null,
        note: '',
      });
    });
  }
  await insertPassOffRows(tx, rows);
  return rungs;
}
