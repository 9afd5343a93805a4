import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { overviewSchema, studentProgressSchema } from '@shared/api/analytics';
import { startTestApp, type TestApp } from '../support/test-app';
import { auditionReady } from '../../server/analytics/attainment-lists';
import { findUserByEmail, loadActor } from '../../server/people/people-queries';
import { buildTinyDistrict, tinyStaff } from '../fixtures/ladder/tiny-district';

let app: TestApp;
let district: Awaited<ReturnType<typeof buildTinyDistrict>>;
let coordinator: ReturnType<TestApp['bearer']>;
let director: ReturnType<TestApp['bearer']>;
let viewer: ReturnType<TestApp['bearer']>;
let technician: ReturnType<TestApp['bearer']>;

const asOf = '2026-12-01';

beforeAll(async () => {
  app = await startTestApp({ template: 'empty' });
  district = await buildTinyDistrict(app.database.db);
  [coordinator, director, viewer, technician] = await Promise.all(
    [tinyStaff.coordinator, tinyStaff.hpmsDirector, tinyStaff.hpmsViewer, tinyStaff.technician].map(
      async (email) => app.bearer(await app.token(email)),
    ),
  );
});
afterAll(() => app?.close());

const keysOf = (rows: { id: number }[]) => {
  const byId = new Map(Object.entries(district.studentId).map(([key, id]) => [id, key]));
  return rows.map((row) => byId.get(row.id)).sort();
};

describe('Analytics overview', () => {
  it('should count the district’s active students by rung, school and grade as worked out by hand', async () => {
    const response = await coordinator.get(`/api/analytics/overview?asOf=${asOf}`);
    expect(response.status).toBe(200);
    const overview = overviewSchema.parse(response.body);
    // s9 is withdrawn. Rung 0: s2 (string scale not yet), s3 (56 < 60), s7 (nothing); rung 1: s1, s8;
    // rung 2: s4, s6 (a later "not yet" keeps the pass); rung 3: s5 (a cellist passes through the woodwind rung).
    expect(overview.studentCount).toBe(8);
    expect(overview.studentsByRung.rungs.map((rung) => rung.students)).toEqual([3, 2, 2, 1]);
    expect(overview.studentsByRung.bySchool.map((school) => [school.code, school.counts])).toEqual([
      ['HPMS', [2, 1, 1, 1]],
      ['QHMS', [1, 1, 1, 0]],
    ]);
    expect(overview.studentsByRung.byGrade.map((grade) => [grade.grade, grade.counts])).toEqual([
      [6, [3, 1, 1, 0]],
      [7, [0, 1, 1, 1]],
    ]);
    expect(overview.studentsByRung.rungs[1]!.drill).toEqual({
      path: '/api/analytics/students',
      query: { asOf, rung: 1 },
    });
  });

  it('should give the share at or above the benchmark in force today, by grade and by school', async () => {
    const overview = overviewSchema.parse(
      (await coordinator.get(`/api/analytics/overview?asOf=${asOf}`)).body,
    );
    // 1 December is before every benchmark date, so each grade's first benchmark applies:
    // grade 6 rung 1 — s1 and s6 of s1, s2, s3, s6, s7 = 2 of 5; grade 7 rung 2 — s4 and s5 of s4, s5, s8 = 2 of 3.
    expect(
      overview.benchmark.byGrade.map(({ grade, rung, byDate, atOrAbove, students, share }) => ({
        grade,
        rung,
        byDate,
        atOrAbove,
        students,
        share,
      })),
    ).toEqual([
      { grade: 6, rung: 1, byDate: '2027-01-31', atOrAbove: 2, students: 5, share: 0.4 },
      { grade: 7, rung: 2, byDate: '2027-01-31', atOrAbove: 2, students: 3, share: 2 / 3 },
    ]);
    // HPMS: s1, s4, s5 of 5 = 60%; QHMS: s6 of s6, s7, s8 = 1 of 3.
    expect(
      overview.benchmark.bySchool.map(({ code, atOrAbove, students, share }) => ({
        code,
        atOrAbove,
        students,
        share,
      })),
    ).toEqual([
      { code: 'HPMS', atOrAbove: 3, students: 5, share: 0.6 },
      { code: 'QHMS', atOrAbove: 1, students: 3, share: 1 / 3 },
    ]);
    const later = overviewSchema.parse(
      (await coordinator.get('/api/analytics/overview?asOf=2027-06-01')).body,
    );
    // From 31 May grade 6 is held to rung 2: only s6 reaches it.
    expect(later.benchmark.byGrade[0]).toMatchObject({
      grade: 6,
      rung: 2,
      atOrAbove: 1,
      students: 5,
    });
  });

  it('should give the median rung by grade', async () => {
    const overview = overviewSchema.parse(
      (await coordinator.get(`/api/analytics/overview?asOf=${asOf}`)).body,
    );
    // Grade 6 rungs 0, 0, 0, 1, 2 → 0; grade 7 rungs 1, 2, 3 → 2; HPMS grade 6 alone: 0, 0, 1 → 0.
    expect(
      overview.medianRungByGrade.map(({ grade, median, students }) => [grade, median, students]),
    ).toEqual([
      [6, 0, 5],
      [7, 2, 3],
    ]);
    const grade7AtHeronPoint = overviewSchema.parse(
      (
        await coordinator.get(
          `/api/analytics/overview?asOf=${asOf}&schoolId=${district.schoolId.HPMS}&grade=7`,
        )
      ).body,
    );
    // s4 on rung 2 and s5 on rung 3: the mean of the two middle values.
    expect(grade7AtHeronPoint.medianRungByGrade).toMatchObject([
      { grade: 7, median: 2.5, students: 2 },
    ]);
  });

  it('should count pass-offs per week of the school year, withdrawn students’ included', async () => {
    const overview = overviewSchema.parse(
      (await coordinator.get(`/api/analytics/overview?asOf=${asOf}`)).body,
    );
    // Mondays from 17 August (first day of the year) to 30 November: 16 weeks.
    expect(overview.passOffsPerWeek).toHaveLength(16);
    expect(overview.passOffsPerWeek[0]!.weekStart).toBe('2026-08-17');
    const busy = overview.passOffsPerWeek
      .filter((week) => week.heard > 0)
      .map(({ weekStart, heard, passed }) => [weekStart, heard, passed]);
    expect(busy).toEqual([
      ['2026-09-07', 8, 8],
      ['2026-09-14', 2, 1],
      ['2026-10-05', 2, 2],
      ['2026-11-23', 3, 1],
    ]);
    expect(overview.passOffsPerWeek.find((week) => week.weekStart === '2026-09-14')!.drill).toEqual(
      {
        path: '/api/pass-offs',
        query: { from: '2026-09-14', to: '2026-09-20' },
      },
    );
    const band = overviewSchema.parse(
      (
        await coordinator.get(
          `/api/analytics/overview?asOf=${asOf}&ensembleId=${district.ensembleId[district.schoolId.QHMS]}`,
        )
      ).body,
    );
    // The Quarry Hill band: s6 (3 hearings), s8 (1), s9 (withdrawn, not a current member).
    expect(
      band.passOffsPerWeek
        .filter((week) => week.heard > 0)
        .map(({ weekStart, heard }) => [weekStart, heard]),
    ).toEqual([
      ['2026-09-07', 2],
      ['2026-10-05', 1],
      ['2026-11-23', 1],
    ]);
  });

  it('should count stalled students and quiet directors', async () => {
    const overview = overviewSchema.parse(
      (await coordinator.get(`/api/analytics/overview?asOf=${asOf}`)).body,
    );
    // No pass-off since 1 November: s1, s2, s3, s8, and s7 who has none.
    expect(overview.stalled).toMatchObject({ days: 30, students: 5 });
    // The Quarry Hill director's last entry was 7 October; the coordinator heard s6 on 26 November.
    expect(
      overview.quietDirectors.directors.map(({ email, lastEntryOn, schoolCodes }) => ({
        email,
        lastEntryOn,
        schoolCodes,
      })),
    ).toEqual([
      { email: tinyStaff.qhmsDirector, lastEntryOn: '2026-10-07', schoolCodes: ['QHMS'] },
    ]);
    const longer = overviewSchema.parse(
      (await coordinator.get(`/api/analytics/overview?asOf=${asOf}&stalledDays=90&quietDays=90`))
        .body,
    );
    // Nothing since 2 September: only s7.
    expect(longer.stalled.students).toBe(1);
    expect(longer.quietDirectors.directors).toEqual([]);
  });

  it('should scope every figure to a director’s or viewer’s schools and refuse the others', async () => {
    for (const client of [director, viewer]) {
      const overview = overviewSchema.parse(
        (await client.get(`/api/analytics/overview?asOf=${asOf}`)).body,
      );
      expect(overview.studentCount).toBe(5);
      expect(overview.studentsByRung.rungs.map((rung) => rung.students)).toEqual([2, 1, 1, 1]);
      expect(overview.studentsByRung.bySchool.map((school) => school.code)).toEqual(['HPMS']);
      expect(
        overview.benchmark.byGrade.map(({ grade, atOrAbove, students }) => [
          grade,
          atOrAbove,
          students,
        ]),
      ).toEqual([
        [6, 1, 3],
        [7, 2, 2],
      ]);
      // Heron Point hearings: s1 1, s2 2, s3 1, s4 3, s5 3.
      expect(overview.passOffsPerWeek.reduce((sum, week) => sum + week.heard, 0)).toBe(10);
      expect(overview.quietDirectors.directors).toEqual([]);
    }
    expect(
      (await director.get(`/api/analytics/overview?schoolId=${district.schoolId.QHMS}`)).status,
    ).toBe(404);
    expect((await technician.get('/api/analytics/overview')).status).toBe(403);
    expect((await technician.get('/api/analytics/students')).status).toBe(403);
  });
});

describe('Analytics drill-down lists', () => {
  it('should list the students behind a figure with the list contract', async () => {
    const belowBenchmark = await coordinator.get(
      `/api/analytics/students?grade=6&belowBenchmark=true&asOf=${asOf}`,
    );
    expect(belowBenchmark.status).toBe(200);
    expect(belowBenchmark.body.total).toBe(3);
    expect(keysOf(belowBenchmark.body.rows)).toEqual(['s2', 's3', 's7']);
    expect(
      belowBenchmark.body.rows.every((row: { benchmarkRung: number }) => row.benchmarkRung === 1),
    ).toBe(true);
    const rungTwo = await coordinator.get('/api/analytics/students?rung=2&sort=lastName:desc');
    expect(rungTwo.body.rows.map((row: { lastName: string }) => row.lastName)).toEqual([
      'TinyS6',
      'TinyS4',
    ]);
    const stalled = await coordinator.get(
      `/api/analytics/students?stalledDays=30&asOf=${asOf}&limit=2&sort=lastName:asc`,
    );
    expect(stalled.body.total).toBe(5);
    expect(stalled.body.rows.map((row: { lastName: string }) => row.lastName)).toEqual([
      'TinyS1',
      'TinyS2',
    ]);
    const mine = await director.get('/api/analytics/students?limit=100');
    expect(mine.body.total).toBe(5);
    expect((await coordinator.get('/api/analytics/students?sort=guardianEmail:asc')).status).toBe(
      400,
    );
  });

  it('should list students ready for an audition on the chosen scales', async () => {
    const atTheirTempos = await coordinator.get(
      '/api/analytics/audition-ready?requirementCodes=r1-bb-major,r2-eb-major',
    );
    expect(atTheirTempos.status).toBe(200);
    expect(keysOf(atTheirTempos.body.rows)).toEqual(['s4', 's5', 's6']);
    const fast = await coordinator.get(
      '/api/analytics/audition-ready?requirementCodes=r1-bb-major,r2-eb-major&minTempo=88',
    );
    expect(keysOf(fast.body.rows)).toEqual(['s5']);
    expect(fast.body.rows[0].bestTempos).toEqual({ 'r1-bb-major': 92, 'r2-eb-major': 88 });
    expect(
      keysOf(
        (await director.get('/api/analytics/audition-ready?requirementCodes=r2-eb-major')).body
          .rows,
      ),
    ).toEqual(['s4', 's5']);
    expect(
      (await coordinator.get('/api/analytics/audition-ready?requirementCodes=r9-unknown')).status,
    ).toBe(400);
  });
});

describe('Audition-ready pages', () => {
  it('should find the same pages walking the students in order as finding the qualifiers first', async () => {
    const { db } = app.database;
    const actors = await Promise.all(
      [tinyStaff.coordinator, tinyStaff.hpmsDirector].map(async (email) => {
        const user = await findUserByEmail(db, email);
        return (await loadActor(db, user!.id, 'token'))!;
      }),
    );
    const queries = [
      { requirementCodes: 'r1-bb-major,r2-eb-major' },
      { requirementCodes: 'r1-bb-major,r2-eb-major', minTempo: '88' },
      { requirementCodes: 'r1-bb-major', sort: 'grade:desc' },
      { requirementCodes: 'r1-bb-major', limit: '2', offset: '1' },
      { requirementCodes: 'r2-eb-major', q: 's' },
    ];
    let found = 0;
    for (const actor of actors) {
      for (const query of queries) {
        const walking = await auditionReady(db, actor, query, { denseFrom: 0 });
        const qualifiersFirst = await auditionReady(db, actor, query, { denseFrom: Infinity });
        expect(walking, JSON.stringify(query)).toEqual(qualifiersFirst);
        found += walking.rows.length;
      }
    }
    // The queries find students, so the two ways are compared on real rows.
    expect(found).toBeGreaterThan(5);
  });

  it('should leave a withdrawn student out of the district-wide count and a searched one', async () => {
    const path = '/api/analytics/audition-ready?requirementCodes=r1-bb-major,r2-eb-major';
    const before = await coordinator.get(path);
    expect(keysOf(before.body.rows)).toEqual(['s4', 's5', 's6']);
    const id = district.studentId['s6']!;
    // The status alone (the summary trigger follows it); a withdrawal through the API would
    // also end s6's seats, which later tests count on.
    const setStatus = (status: string) =>
      app.database.db.execute(sql`update students set status = ${status} where id = ${id}`);
    await setStatus('withdrawn');
    try {
      const after = await coordinator.get(path);
      expect(after.body).toMatchObject({ total: 2 });
      expect(keysOf(after.body.rows)).toEqual(['s4', 's5']);
      expect((await coordinator.get(`${path}&q=s`)).body.total).toBe(2);
    } finally {
      await setStatus('active');
    }
    expect((await coordinator.get(path)).body.total).toBe(3);
  });
});

describe('Student progress', () => {
  it('should show rung, met and next requirements, and why a pass-off does not count', async () => {
    const s3 = studentProgressSchema.parse(
      (await director.get(`/api/analytics/students/${district.studentId['s3']}/progress`)).body,
    );
    expect(s3).toMatchObject({ rung: 0, family: 'brass', metRequirementCodes: [] });
    expect(s3.next.rung).toBe(1);
    expect(s3.next.requirements.map((item) => item.code)).toEqual([
      'r1-bb-major',
      'r1-c-chromatic',
    ]);
    expect(s3.notes).toHaveLength(1);
    expect(s3.history[0]!.standing).toBe('below-tempo');
    const s5 = studentProgressSchema.parse(
      (await director.get(`/api/analytics/students/${district.studentId['s5']}/progress`)).body,
    );
    expect(s5).toMatchObject({ rung: 3, rungCount: 3, next: { rung: null, requirements: [] } });
    expect(s5.metRequirementCodes.sort()).toEqual([
      'r1-bb-major',
      'r1-d-major-strings',
      'r2-eb-major',
    ]);
    expect(s5.benchmark).toEqual({ rung: 2, byDate: '2027-01-31', atOrAbove: true });
    expect(
      (await director.get(`/api/analytics/students/${district.studentId['s6']}/progress`)).status,
    ).toBe(404);
    expect(
      (await technician.get(`/api/analytics/students/${district.studentId['s1']}/progress`)).status,
    ).toBe(403);
  });
});

describe('Analytics after roster changes', () => {
  it('should follow a move, a withdrawal and a new seat without a rebuild', async () => {
    const db = app.database.db;
    const { sql } = await import('drizzle-orm');
    // s1 (HPMS, rung 1) moves to Quarry Hill; s2 withdraws; s7 (horn) takes a violin seat instead.
    await db.execute(
      sql`update students set school_id = ${district.schoolId.QHMS} where id = ${district.studentId['s1']!}`,
    );
    await db.execute(
      sql`update students set status = 'withdrawn' where id = ${district.studentId['s2']!}`,
    );
    await db.execute(
      sql`update enrollments set instrument_id = 'violin' where student_id = ${district.studentId['s7']!}`,
    );
    const overview = overviewSchema.parse(
      (await coordinator.get(`/api/analytics/overview?asOf=${asOf}`)).body,
    );
    expect(overview.studentCount).toBe(7);
    // Rung 0 now: s3, s7; rung 1: s1, s8; rung 2: s4, s6; rung 3: s5.
    expect(overview.studentsByRung.bySchool.map((school) => [school.code, school.counts])).toEqual([
      ['HPMS', [1, 0, 1, 1]],
      ['QHMS', [1, 2, 1, 0]],
    ]);
    const s7 = studentProgressSchema.parse(
      (await coordinator.get(`/api/analytics/students/${district.studentId['s7']}/progress`)).body,
    );
    expect(s7.family).toBe('strings');
    expect(s7.next.requirements.map((item) => item.code)).toEqual([
      'r1-bb-major',
      'r1-d-major-strings',
      'r1-c-chromatic',
    ]);
  });
});
