import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { rowsOf } from '../../server/db/client';
import {
  retentionStudentListSchema,
  yearOverYearSchema,
  type YearOverYear,
} from '@shared/api/year-over-year';
import { demoEmail, startTestApp, type TestApp } from '../support/test-app';
import { plainMedian } from '../support/plain-median';

interface Ensemble {
  id: number;
  name: string;
  memberCount: number;
}

let app: TestApp;
let coordinator: ReturnType<TestApp['bearer']>;
let director: ReturnType<TestApp['bearer']>;
let viewer: ReturnType<TestApp['bearer']>;
let student: ReturnType<TestApp['bearer']>;
let schoolIds: Record<string, number>;

interface LastYearRow {
  student_id: number;
  code: string;
  grade: number;
  outcome: string;
  status: string;
}
let lastYear: LastYearRow[];

beforeAll(async () => {
  const started = await startTestApp();
  app = started;
  schoolIds = started.schoolIds;
  [coordinator, director, viewer, student] = await Promise.all(
    ['coordinator', 'director.hpms', 'viewer.trhs', 'student.hpms'].map(async (local) =>
      app.bearer(await app.token(demoEmail(local))),
    ),
  );
  const db = app.database.db;
  // The plain rows the figures are counted from: last year's history and today's status.
  lastYear = rowsOf<LastYearRow>(
    await db.execute(sql`
      select sy.student_id, sc.code, sy.grade, sy.outcome, s.status
      from student_years sy join school_years y on y.id = sy.school_year_id and y.name = '2025-26'
      join schools sc on sc.id = sy.school_id join students s on s.id = sy.student_id`),
  );
});
afterAll(() => app?.close());

/** Of last year's players still in the district, how many are active now. */
function plainRetention(rows: LastYearRow[]) {
  const players = rows.filter((row) => row.outcome === 'promoted' || row.outcome === 'moving-up');
  const continued = players.filter((row) => row.status === 'active').length;
  return { players: players.length, continued };
}

describe('Year over year', () => {
  it('should count retention by school and by transition as a plain count of last year’s players does', async () => {
    const response = await coordinator.get('/api/analytics/year-over-year');
    expect(response.status).toBe(200);
    const figures = yearOverYearSchema.parse(response.body);
    expect(figures.year.name).toBe('2026-27');
    expect(figures.previousYear?.name).toBe('2025-26');
    expect(figures.retention.total).toMatchObject(plainRetention(lastYear));
    for (const code of ['FBES', 'CWES', 'HPMS', 'QHMS', 'OMMS', 'TRHS']) {
      const school = figures.retention.bySchool.find((row) => row.code === code)!;
      expect(school, code).toMatchObject(
        plainRetention(lastYear.filter((row) => row.code === code)),
      );
      expect(school.share).toBeCloseTo(school.continued / school.players, 10);
    }
    for (const grade of [4, 5, 6, 7, 8, 9, 10, 11]) {
      const transition = figures.retention.byTransition.find((row) => row.fromGrade === grade)!;
      expect(transition, `grade ${grade}`).toMatchObject({
        toGrade: grade + 1,
        ...plainRetention(lastYear.filter((row) => row.grade === grade)),
      });
    }
    // The demo's feeders: grade 5 leaves the elementaries, grade 8 the middle schools.
    const changing = figures.retention.byTransition.filter((row) => row.changesSchool);
    expect(changing.map((row) => row.fromGrade)).toEqual([5, 8]);
    // The demo's invented rates: more stop where they change schools than within one.
    const shareOf = (grade: number) =>
      figures.retention.byTransition.find((row) => row.fromGrade === grade)!.share!;
    expect(shareOf(5)).toBeLessThan(shareOf(6));
    expect(shareOf(8)).toBeLessThan(shareOf(9));
    // Graduates are not counted as stopping.
    expect(figures.retention.byTransition.some((row) => row.fromGrade === 12)).toBe(false);
  });

  it('should name exactly the students who stopped at a transition', async () => {
    const response = await coordinator.get(
      `/api/analytics/retention/students?schoolId=${schoolIds['FBES']}&grade=5&stopped=true&limit=500`,
    );
    expect(response.status).toBe(200);
    const list = retentionStudentListSchema.parse(response.body);
    const expected = lastYear
      .filter(
        (row) =>
          row.code === 'FBES' &&
          row.grade === 5 &&
          row.outcome === 'moving-up' &&
          row.status !== 'active',
      )
      .map((row) => row.student_id)
      .sort((a, b) => a - b);
    expect(expected.length).toBeGreaterThan(0);
    expect(list.total).toBe(expected.length);
    expect(list.rows.map((row) => row.id).sort((a, b) => a - b)).toEqual(expected);
    expect(list.rows.every((row) => !row.continued && row.lastSchoolCode === 'FBES')).toBe(true);
    // Elementary students move up to the middle school their school sends to.
    expect(new Set(list.rows.map((row) => row.schoolCode))).toEqual(new Set(['HPMS']));
  });

  it('should keep a director to the students who played at their school', async () => {
    const figures = yearOverYearSchema.parse(
      (await director.get('/api/analytics/year-over-year')).body,
    );
    expect(figures.retention.bySchool.map((row) => row.code)).toEqual(['HPMS']);
    expect(figures.retention.total).toMatchObject(
      plainRetention(lastYear.filter((row) => row.code === 'HPMS')),
    );
    const names = retentionStudentListSchema.parse(
      (await director.get('/api/analytics/retention/students?stopped=true&limit=500')).body,
    );
    expect(names.total).toBeGreaterThan(0);
    expect(names.rows.every((row) => row.lastSchoolCode === 'HPMS')).toBe(true);
    // Another school's names are not there to be asked for.
    expect(
      (await director.get(`/api/analytics/retention/students?schoolId=${schoolIds['QHMS']}`))
        .status,
    ).toBe(404);
    expect(
      (await director.get(`/api/analytics/year-over-year?schoolId=${schoolIds['FBES']}`)).status,
    ).toBe(404);
    const viewed = yearOverYearSchema.parse(
      (await viewer.get('/api/analytics/year-over-year')).body,
    );
    expect(viewed.retention.bySchool.map((row) => row.code)).toEqual(['TRHS']);
  });

  it('should refuse a student and bad or unknown query parameters', async () => {
    expect((await student.get('/api/analytics/year-over-year')).status).toBe(403);
    expect((await student.get('/api/analytics/retention/students')).status).toBe(403);
    expect((await app.anonymous.get('/api/analytics/year-over-year')).status).toBe(401);
    const unknown = await coordinator.get('/api/analytics/year-over-year?year=2025');
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.fieldErrors[0]).toMatchObject({ field: 'year' });
    expect((await coordinator.get('/api/analytics/retention/students?grade=13')).status).toBe(400);
    expect((await coordinator.get('/api/analytics/retention/students?stopped=maybe')).status).toBe(
      400,
    );
    expect(
      (await coordinator.get('/api/analytics/year-over-year?schoolYearId=999999')).status,
    ).toBe(404);
  });

  it('should read a past year against the one before it, and the first year against none', async () => {
    const years = (await coordinator.get('/api/school-years')).body as {
      rows: { id: number; name: string }[];
    };
    const first = years.rows.find((row) => row.name === '2025-26')!;
    const figures = yearOverYearSchema.parse(
      (await coordinator.get(`/api/analytics/year-over-year?schoolYearId=${first.id}`)).body,
    );
    expect(figures.year.name).toBe('2025-26');
    expect(figures.previousYear).toBeNull();
    expect(figures.retention.total).toEqual({ players: 0, continued: 0, share: null });
  });

  it('should give each cohort’s median rung at each year’s end and now', async () => {
    const figures: YearOverYear = yearOverYearSchema.parse(
      (await coordinator.get('/api/analytics/year-over-year')).body,
    );
    const db = app.database.db;
    // Those first on record in 2025-26 in grade 7: their rungs at its end, and their rungs now.
    const ends = rowsOf<{ student_id: number; rung: number }>(
      await db.execute(sql`
        select sy.student_id, sy.rung from student_years sy join school_years y on y.id = sy.school_year_id
        where y.name = '2025-26' and sy.grade = 7 and sy.outcome <> 'withdrawn'`),
    );
    const now = rowsOf<{ rung: number }>(
      await db.execute(sql`
        select a.rung from student_attainment a
        where a.active and a.student_id = any(${`{${ends.map((row) => row.student_id).join(',')}}`}::int[])`),
    );
    const cohort = figures.cohorts.find(
      (entry) => entry.startYear === '2025-26' && entry.startGrade === 7,
    )!;
    expect(cohort.points).toEqual([
      { year: '2025-26', median: plainMedian(ends.map((row) => row.rung)), students: ends.length },
      { year: '2026-27', median: plainMedian(now.map((row) => row.rung)), students: now.length },
    ]);
    // A climb: a cohort's median does not fall from one year's end to the next in the demo.
    expect(cohort.points[1]!.median).toBeGreaterThanOrEqual(cohort.points[0]!.median);
  });

  it('should count an ensemble’s members of a past year when the list is asked for that year', async () => {
    const years = (await director.get('/api/school-years')).body as {
      rows: { id: number; name: string }[];
    };
    const past = years.rows.find((row) => row.name === '2025-26')!;
    const now = (await director.get('/api/ensembles?limit=50')).body.rows as Ensemble[];
    const then = (await director.get(`/api/ensembles?limit=50&schoolYearId=${past.id}`)).body
      .rows as Ensemble[];
    const seats = rowsOf<{ ensemble_id: number; seats: number }>(
      await app.database.db.execute(sql`
        select ensemble_id, count(*)::int as seats from enrollments
        where school_year_id = ${past.id} and active group by 1`),
    );
    expect(then.map((row) => row.id)).toEqual(now.map((row) => row.id));
    for (const ensemble of then) {
      expect(ensemble.memberCount, ensemble.name).toBe(
        seats.find((row) => row.ensemble_id === ensemble.id)?.seats ?? 0,
      );
    }
    expect(then.some((row, index) => row.memberCount !== now[index]!.memberCount)).toBe(true);
    expect((await director.get('/api/ensembles?schoolYearId=x')).status).toBe(400);
  });

  it('should follow a status change made today in the counts and the names', async () => {
    const hpms = schoolIds['HPMS']!;
    const figuresOf = async () =>
      yearOverYearSchema.parse(
        (await coordinator.get(`/api/analytics/year-over-year?schoolId=${hpms}`)).body,
      ).retention.total;
    const before = await figuresOf();
    const player = lastYear.find(
      (row) => row.code === 'HPMS' && row.outcome === 'promoted' && row.status === 'active',
    )!;
    const setStatus = async (status: string) => {
      const current = (await director.get(`/api/students/${player.student_id}`)).body as {
        version: number;
      };
      const patch = await director.patch(`/api/students/${player.student_id}`, {
        status,
        version: current.version,
      });
      expect(patch.status).toBe(200);
    };
    await setStatus('withdrawn');
    // The plain count again, from today's status.
    const recounted = rowsOf<{ players: number; continued: number }>(
      await app.database.db.execute(sql`
        select count(*)::int as players, count(*) filter (where s.status = 'active')::int as continued
        from student_years sy join school_years y on y.id = sy.school_year_id and y.name = '2025-26'
        join students s on s.id = sy.student_id
        where sy.school_id = ${hpms} and sy.outcome in ('promoted', 'moving-up')`),
    )[0]!;
    const withdrawn = await figuresOf();
    expect(withdrawn.continued).toBe(before.continued - 1);
    expect({ players: withdrawn.players, continued: withdrawn.continued }).toEqual(recounted);
    const stopped = retentionStudentListSchema.parse(
      (
        await coordinator.get(
          `/api/analytics/retention/students?schoolId=${hpms}&stopped=true&limit=500`,
        )
      ).body,
    );
    expect(stopped.rows.some((row) => row.id === player.student_id && !row.continued)).toBe(true);
    await setStatus('active');
    expect(await figuresOf()).toEqual(before);
  });
});
