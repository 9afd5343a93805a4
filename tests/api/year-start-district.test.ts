import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { rowsOf } from '../../server/db/client';
import { SeededRandom } from '../../server/seed/random';
import { startSchoolYear } from '../../server/school-years/year-start';
import { yearOverYear } from '../../server/analytics/year-over-year';
import { studentCountDrift } from '../support/student-counts';
import { rungCountDrift } from '../support/rung-counts';
import { startTestApp, type TestApp } from '../support/test-app';
import {
  carriedSeatPairs,
  expectedStart,
  readRosterBefore,
  seatsOfYear,
  type RosterBefore,
} from '../support/year-start-expectation';
import { plainMedian } from '../support/plain-median';

let app: TestApp;
const next = {
  name: '2027-28',
  startsOn: '2027-08-16',
  endsOn: '2028-06-09',
  emptyEnsembles: false,
};

async function query<Row>(text: string): Promise<Row[]> {
  return rowsOf<Row>(await app.database.db.execute(text as never));
}

/**
 * An invented district of 2,000 students: two elementaries (K-5) feeding two middle schools, a
 * K-8 school that feeds no one, an elementary that closes before the new year (its students
 * move up early), a high school (9-12), students withdrawn along the way, seats in this year and
 * the last, and loans open, returned and lost, due at the year's end or later.
 */
async function buildDistrict(random: SeededRandom) {
  const schools: [string, number, number, string | null, string | null][] = [
    ['HIGH', 9, 12, null, null],
    ['MIDA', 6, 8, 'HIGH', null],
    ['MIDB', 6, 8, 'HIGH', null],
    ['ELEA', 0, 5, 'MIDA', null],
    ['ELEB', 0, 5, 'MIDB', null],
    ['KEIGHT', 0, 8, null, null],
    ['ELEC', 0, 5, 'MIDA', '2027-07-01'],
  ];
  for (const [code, lowest, highest, , closedOn] of schools) {
    await query(`insert into schools (code, name, level, lowest_grade, highest_grade, closed_on)
      values ('${code}', '${code} School', 'other', ${lowest}, ${highest}, ${closedOn ? `'${closedOn}'` : 'null'})`);
  }
  for (const [code, , , sendsTo] of schools) {
    if (sendsTo)
      await query(
        `update schools set sends_to_school_id = (select id from schools where code = '${sendsTo}') where code = '${code}'`,
      );
  }
  await query(`insert into school_years (name, starts_on, ends_on, current) values
    ('2025-26', '2025-08-18', '2026-06-12', false), ('2026-27', '2026-08-17', '2027-06-11', true)`);
  const schoolRows = await query<{
    id: number;
    code: string;
    lowest_grade: number;
    highest_grade: number;
  }>('select id, code, lowest_grade, highest_grade from schools order by id');
  const values: string[] = [];
  for (let index = 0; index < 2_000; index += 1) {
    const school = schoolRows[random.integer(0, schoolRows.length - 1)]!;
    const grade = random.integer(school.lowest_grade, school.highest_grade);
    const status = random.next() < 0.06 ? 'withdrawn' : 'active';
    values.push(
      `('${700_000 + index}', 'First${index}', 'Last${index}', ${grade}, ${school.id}, '${status}')`,
    );
  }
  await query(
    `insert into students (student_number, first_name, last_name, grade, school_id, status) values ${values.join(',')}`,
  );
  for (const school of schoolRows) {
    for (const name of ['Band', 'Orchestra', 'Jazz']) {
      await query(
        `insert into ensembles (school_id, name, kind) values (${school.id}, '${name}', 'concert-band')`,
      );
    }
  }
  const students = await query<{ id: number; school_id: number }>(
    'select id, school_id from students order by id',
  );
  const ensembles = await query<{ id: number; school_id: number }>(
    'select id, school_id from ensembles order by id',
  );
  const [lastYear, thisYear] = (
    await query<{ id: number }>('select id from school_years order by starts_on')
  ).map((row) => row.id);
  const seats: string[] = [];
  for (const student of students) {
    const own = ensembles.filter((ensemble) => ensemble.school_id === student.school_id);
    const seatCount = random.integer(0, 2);
    for (let index = 0; index < seatCount; index += 1) {
      const ensemble = own[index]!;
      seats.push(`(${student.id}, ${ensemble.id}, ${thisYear}, ${random.next() < 0.9})`);
    }
    if (random.next() < 0.3) seats.push(`(${student.id}, ${own[2]!.id}, ${lastYear}, true)`);
    // A few seats at another school's ensemble (a student who moved mid-year): they end.
    if (random.next() < 0.02) {
      const elsewhere = ensembles.find((ensemble) => ensemble.school_id !== student.school_id)!;
      seats.push(`(${student.id}, ${elsewhere.id}, ${thisYear}, true)`);
    }
  }
  await query(
    `insert into enrollments (student_id, ensemble_id, school_year_id, active) values ${seats.join(',')}`,
  );
  const loans: string[] = [];
  for (let index = 0; index < 300; index += 1) {
    const student = students[random.integer(0, students.length - 1)]!;
    const [instrument] = await query<{ id: number }>(
      `insert into instruments (asset_tag, instrument_id, home_school_id) values ('T-${index}', 'trumpet', ${student.school_id}) returning id`,
    );
    const state = random.next() < 0.8 ? 'active' : random.next() < 0.5 ? 'returned' : 'lost';
    const dueOn =
      random.next() < 0.6 ? '2027-06-11' : random.next() < 0.5 ? '2027-01-15' : '2027-12-18';
    loans.push(
      `(${instrument!.id}, ${student.id}, ${student.school_id}, '2026-09-01', '${dueOn}', 'good', '${state}', ${state === 'returned' ? "'2027-01-10'" : 'null'})`,
    );
  }
  await query(
    `insert into loans (instrument_id, student_id, school_id, checked_out_on, due_on, condition_out, state, returned_on) values ${loans.join(',')}`,
  );
}

let before: RosterBefore;

beforeAll(async () => {
  app = await startTestApp({ template: 'empty' });
  await buildDistrict(new SeededRandom(20270816));
  before = await readRosterBefore(app.database);
}, 120_000);
afterAll(() => app?.close());

describe('Starting a year in a 2,000-student district', () => {
  it('should count every figure, school by school, as the plain computation does', async () => {
    const expected = expectedStart(before, next.startsOn);
    const preview = await startSchoolYear(app.database.db, null, next, { commit: false });
    expect(expected.counts.students).toBeGreaterThan(1_800);
    for (const figure of [
      'promoted',
      'graduated',
      'movingUp',
      'leaving',
      'seats',
      'loansCarried',
      'loansDueBack',
    ] as const) {
      expect(expected.counts[figure], figure).toBeGreaterThan(0);
    }
    expect(expected.counts.loansDueBack).toBeLessThan(expected.counts.loansCarried);
    // The preview's figures named by the plain computation's counts, compared as one object.
    const figures = Object.keys(expected.counts) as (keyof typeof expected.counts)[];
    expect(Object.fromEntries(figures.map((figure) => [figure, preview[figure]]))).toEqual(
      expected.counts,
    );
    // School by school, from the plan's own rows.
    for (const school of preview.schools) {
      const mine = [...expected.outcomes].filter(
        ([id]) =>
          before.students.find((student) => student.id === id)!.schoolId === school.schoolId,
      );
      expect(school.students, school.code).toBe(mine.length);
      expect(school.movingUp, school.code).toBe(
        mine.filter(([, row]) => row.outcome === 'moving-up').length,
      );
      expect(school.leaving, school.code).toBe(
        mine.filter(([, row]) => row.outcome === 'leaving').length,
      );
      expect(school.graduated, school.code).toBe(
        mine.filter(([, row]) => row.outcome === 'graduated').length,
      );
    }
    // The closing elementary sends everyone up; the K-8 school with no sends-to loses its eighth graders.
    expect(preview.schools.find((school) => school.code === 'ELEC')!.promoted).toBe(0);
    expect(preview.schools.find((school) => school.code === 'KEIGHT')!.leaving).toBeGreaterThan(0);
    expect(preview.unplaced).toHaveLength(expected.counts.leaving);
    expect(preview.schools.find((school) => school.code === 'ELEC')!.ensembles).toBe(0);
  });

  it('should write exactly the plan: every student, every seat, the history and the switch', async () => {
    const expected = expectedStart(before, next.startsOn);
    const started = await startSchoolYear(app.database.db, null, next, { commit: true });
    expect(started.committed).toBe(true);
    const after = await query<{ id: number; school_id: number; grade: number; status: string }>(
      'select id, school_id, grade, status from students order by id',
    );
    const wrong = after.filter((row) => {
      const planned = expected.outcomes.get(row.id);
      const was = before.students.find((student) => student.id === row.id)!;
      const want = planned
        ? { schoolId: planned.schoolId, grade: planned.grade, status: planned.status }
        : was;
      return (
        row.school_id !== want.schoolId || row.grade !== want.grade || row.status !== want.status
      );
    });
    expect(wrong).toEqual([]);
    expect(await seatsOfYear(app.database, '2027-28')).toEqual(carriedSeatPairs(expected));
    const history = await query<{
      student_id: number;
      outcome: string;
      grade: number;
      school_id: number;
    }>(
      `select student_id, outcome, grade, school_id from student_years where school_year_id = ${before.currentYear.id} and outcome <> 'withdrawn' order by 1`,
    );
    expect(history.length).toBe(expected.counts.students);
    for (const row of history) {
      const was = before.students.find((student) => student.id === row.student_id)!;
      expect({ outcome: row.outcome, grade: row.grade, school: row.school_id }).toEqual({
        outcome: expected.outcomes.get(row.student_id)!.outcome,
        grade: was.grade,
        school: was.schoolId,
      });
    }
    // Whether each of the closed year's players played on: exactly those active in the new year.
    const continued = await query<{ student_id: number; continued: boolean }>(
      `select student_id, continued from student_years where school_year_id = ${before.currentYear.id} order by 1`,
    );
    const activeNow = new Set(after.filter((row) => row.status === 'active').map((row) => row.id));
    expect(continued.length).toBeGreaterThan(expected.counts.students - 1);
    expect(continued.filter((row) => row.continued !== activeNow.has(row.student_id))).toEqual([]);
    const [moves] = await query<{ count: number }>(
      'select count(*)::int as count from school_moves',
    );
    expect(moves!.count).toBe(expected.counts.movingUp);
    expect(await studentCountDrift(app.database.db)).toEqual([]);
    expect(await rungCountDrift(app.database.db)).toEqual([]);
    expect(await query(`select name from school_years where current`)).toEqual([
      { name: '2027-28' },
    ]);
  });

  it('should climb each cohort over two starts as a plain reading of the history does', async () => {
    const started = await startSchoolYear(
      app.database.db,
      null,
      { name: '2028-29', startsOn: '2028-08-14', endsOn: '2029-06-08', emptyEnsembles: false },
      { commit: true },
    );
    expect(started.committed).toBe(true);
    expect(await rungCountDrift(app.database.db)).toEqual([]);
    const played = await query<{ student_id: number; year: string; grade: number; rung: number }>(
      `select sy.student_id, y.name as year, sy.grade, sy.rung from student_years sy
       join school_years y on y.id = sy.school_year_id
       where sy.outcome <> 'withdrawn' order by y.starts_on`,
    );
    const now = await query<{ student_id: number; grade: number; rung: number }>(
      'select student_id, grade, rung from student_attainment where active',
    );
    // The plain reading: a student's cohort is the first year they played in and their grade then.
    const first = new Map<number, { year: string; grade: number }>();
    for (const row of played)
      if (!first.has(row.student_id))
        first.set(row.student_id, { year: row.year, grade: row.grade });
    const points = new Map<string, number[]>();
    const add = (studentId: number, year: string, grade: number, rung: number) => {
      const cohort = first.get(studentId) ?? { year, grade };
      const key = `${cohort.year}|${cohort.grade}|${year}`;
      points.set(key, [...(points.get(key) ?? []), rung]);
    };
    for (const row of played) add(row.student_id, row.year, row.grade, row.rung);
    for (const row of now) add(row.student_id, '2028-29', row.grade, row.rung);
    const expected = [...points]
      .map(([key, rungs]) => `${key}|${plainMedian(rungs)}|${rungs.length}`)
      .sort();
    const figures = await yearOverYear(
      app.database.db,
      {
        userId: 0,
        email: 'coordinator@example.invalid',
        name: 'Coordinator',
        role: 'coordinator',
        schoolIds: [],
        studentId: null,
        via: 'token',
      },
      {},
    );
    const answered = figures.cohorts
      .flatMap((cohort) =>
        cohort.points.map(
          (point) =>
            `${cohort.startYear}|${cohort.startGrade}|${point.year}|${point.median}|${point.students}`,
        ),
      )
      .sort();
    expect(answered).toEqual(expected);
    // Three years of points: the two closed by the starts and the current one.
    expect(new Set(answered.map((entry) => entry.split('|')[2]))).toEqual(
      new Set(['2026-27', '2027-28', '2028-29']),
    );
  });
});
