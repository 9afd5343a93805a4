import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import request from 'supertest';
import { gunzipSync } from 'node:zlib';
import { rowsOf } from '../../server/db/client';
import { studentCountDrift } from '../support/student-counts';
import { startTestApp, type SignedInClient, type TestApp } from '../support/test-app';
import {
  carriedSeatPairs,
  expectedStart,
  readRosterBefore,
  seatsOfYear,
} from '../support/year-start-expectation';
import { binary } from '../support/binary-body';

let app: TestApp;
let coordinator: SignedInClient;
let director: SignedInClient;
let student: SignedInClient;

const next = { name: '2027-28', startsOn: '2027-08-16', endsOn: '2028-06-09' };

beforeAll(async () => {
  const started = await startTestApp({ signIn: ['coordinator', 'director.hpms', 'student.hpms'] });
  app = started;
  ({ coordinator, 'director.hpms': director, 'student.hpms': student } = started.clients);
});
afterAll(() => app?.close());

async function query<Row>(text: string): Promise<Row[]> {
  return rowsOf<Row>(await app.database.db.execute(text as never));
}

/** Every table a start writes, counted, and the current year: what "nothing written" compares. */
async function footprint() {
  const [row] = await query<Record<string, unknown>>(`select
    (select count(*)::int from school_years) as years,
    (select name from school_years where current) as current,
    (select count(*)::int from student_years) as history,
    (select count(*)::int from enrollments) as seats,
    (select sum(grade)::int from students) as grades,
    (select count(*)::int from students where status = 'active') as active,
    (select count(*)::int from school_moves) as moves`);
  return row!;
}

/** Adds a school year as the form does: `POST /api/school-years` with its name and first and last days. */
const addYear = (client: SignedInClient, name: string, startsOn: string, endsOn: string) =>
  client.post('/api/school-years', { name, startsOn, endsOn });

describe('School years', () => {
  it('should list the years to every signed-in role with exactly one current', async () => {
    for (const client of [coordinator, director, student]) {
      const response = await client.get('/api/school-years');
      expect(response.status).toBe(200);
      expect(response.body.rows.filter((row: { current: boolean }) => row.current)).toHaveLength(1);
      // The demo's years, oldest first: 2025-26 ended, 2026-27 current.
      expect(response.body.rows.map((row: { name: string }) => row.name)).toEqual([
        '2025-26',
        '2026-27',
      ]);
      expect(response.body.rows[1].current).toBe(true);
    }
    expect((await app.anonymous.get('/api/school-years')).status).toBe(401);
  });

  it('should let only the coordinator add a year, not current, and refuse bad, overlapping or named-twice years', async () => {
    const before = await footprint();
    expect((await addYear(director, '2024-25', '2024-08-19', '2025-06-13')).status).toBe(403);
    const badDates = await addYear(coordinator, '2024-25', '2025-06-13', '2024-08-19');
    expect(badDates.status).toBe(400);
    expect(badDates.body.error.fieldErrors[0].field).toBe('endsOn');
    expect((await addYear(coordinator, '2024-25', '2024-02-30', '2025-06-13')).status).toBe(400);
    const overlapping = await addYear(coordinator, '2024-25', '2024-08-19', '2026-09-01');
    expect(overlapping.status).toBe(400);
    expect(overlapping.body.error.message).toContain('overlaps 2026-27');
    const twice = await addYear(coordinator, '2026-27', '2030-08-19', '2031-06-01');
    expect(twice.status).toBe(400);
    expect(twice.body.error.message).toContain('already exists');
    expect(await footprint()).toEqual(before);

    const created = await addYear(coordinator, '2024-25', '2024-08-19', '2025-06-13');
    expect(created.status).toBe(201);
    expect(created.body).toMatchObject({ name: '2024-25', current: false, past: true });
    const renamed = await coordinator.patch(`/api/school-years/${created.body.id}`, {
      name: '2024–25',
      version: created.body.version,
    });
    expect(renamed.status).toBe(200);
    expect(renamed.body.name).toBe('2024–25');
    const stale = await coordinator.patch(`/api/school-years/${created.body.id}`, {
      name: '2024-25',
      version: created.body.version,
    });
    expect(stale.status).toBe(409);
    const notCurrent = await coordinator.patch(`/api/school-years/${created.body.id}`, {
      current: false,
      version: renamed.body.version,
    });
    expect(notCurrent.status).toBe(400);
    expect(
      (
        await director.patch(`/api/school-years/${created.body.id}`, {
          name: 'x2024',
          version: renamed.body.version,
        })
      ).status,
    ).toBe(403);
  });

  it('should switch the current year in one step when a year is made current, keeping exactly one', async () => {
    const years = (await coordinator.get('/api/school-years')).body.rows as {
      id: number;
      name: string;
      version: number;
      current: boolean;
    }[];
    const older = years.find((year) => year.name === '2024–25')!;
    const current = years.find((year) => year.current)!;
    const switched = await coordinator.patch(`/api/school-years/${older.id}`, {
      current: true,
      version: older.version,
    });
    expect(switched.status).toBe(200);
    let rows = (await coordinator.get('/api/school-years')).body.rows as {
      id: number;
      current: boolean;
      version: number;
    }[];
    expect(rows.filter((row) => row.current).map((row) => row.id)).toEqual([older.id]);
    const back = rows.find((row) => row.id === current.id)!;
    expect(
      (
        await coordinator.patch(`/api/school-years/${current.id}`, {
          current: true,
          version: back.version,
        })
      ).status,
    ).toBe(200);
    rows = (await coordinator.get('/api/school-years')).body.rows;
    expect(rows.filter((row) => row.current).map((row) => row.id)).toEqual([current.id]);
  });
});

describe('Starting a new school year', () => {
  it('should offer the coordinator a backup to download before the start, one that gunzips', async () => {
    const backup = await binary(
      request(app.url).get('/api/backup').set({ Cookie: coordinator.cookie }),
    );
    if (process.env['TEST_DATABASE_URL']) {
      // On a PostgreSQL server the backup is pg_dump's, and the answer says so.
      expect(backup.status).toBe(409);
      expect((await director.get('/api/backup')).status).toBe(403);
      return;
    }
    expect(backup.status).toBe(200);
    expect(backup.headers['content-disposition']).toMatch(
      /attachment; filename="?tuttiboard-backup-\d{4}-\d{2}-\d{2}[-\d]*\.tar\.gz"?/,
    );
    // RFC 1952 (gzip): a member starts with the bytes 0x1f 0x8b.
    expect([...(backup.body as Buffer).subarray(0, 2)]).toEqual([0x1f, 0x8b]);
    expect(gunzipSync(backup.body as Buffer).length).toBeGreaterThan(1_000_000);
    expect((await director.get('/api/backup')).status).toBe(403);
  });

  it('should refuse a start with bad dates, an existing or overlapping year, or one before the current, writing nothing', async () => {
    const before = await footprint();
    const cases: [object, string][] = [
      [{ ...next, startsOn: '2028-06-09', endsOn: '2027-08-16' }, 'first day comes before'],
      [
        { ...next, name: '2026-27', startsOn: '2030-08-01', endsOn: '2031-06-01' },
        'already exists',
      ],
      [{ ...next, startsOn: '2027-05-01' }, 'overlaps 2026-27'],
      [
        { ...next, name: '2023-24', startsOn: '2023-08-14', endsOn: '2024-06-07' },
        'must start after',
      ],
      [{ ...next, startsOn: 'next monday' }, 'YYYY-MM-DD'],
    ];
    for (const [body, reason] of cases) {
      for (const path of ['/api/school-years/start/preview', '/api/school-years/start']) {
        const response = await coordinator.post(path, body);
        expect(response.status, JSON.stringify(body)).toBe(400);
        expect(JSON.stringify(response.body.error)).toContain(reason);
      }
    }
    expect((await director.post('/api/school-years/start', next)).status).toBe(403);
    expect((await director.post('/api/school-years/start/preview', next)).status).toBe(403);
    expect(await footprint()).toEqual(before);
  });

  it('should stop the commit when a roster import landed since the preview, writing nothing', async () => {
    const preview = await coordinator.post('/api/school-years/start/preview', next);
    expect(preview.status).toBe(200);
    const header =
      'student_id,first_name,last_name,preferred_name,grade,school_code,ensemble,instrument,guardian_name,guardian_email';
    const file = Buffer.from(`${header}\r\n990001,Wren,Marlowe,,7,HPMS,,,,\r\n`);
    const uploaded = await coordinator.upload('/api/imports/preview', 'file', file, 'late.csv');
    expect(uploaded.status).toBe(200);
    const imported = await coordinator.post('/api/imports/commit', {
      importToken: uploaded.body.importToken,
      withdrawMissing: false,
      skipInvalid: false,
    });
    expect(imported.body.committed).toBe(true);
    const before = await footprint();
    const stopped = await coordinator.post('/api/school-years/start', {
      ...next,
      basis: preview.body.basis,
    });
    expect(stopped.status).toBe(409);
    expect(stopped.body.error.message).toContain('roster import landed since the preview');
    expect(await footprint()).toEqual(before);
  });

  it('should preview and then start the year by every rule, counted as a plain computation counts', async () => {
    // One middle school with nowhere to send its eighth graders, so some students leave.
    await query(`update schools set sends_to_school_id = null where code = 'OMMS'`);
    await query(`insert into pass_offs (student_id, school_id, grade, ladder_version_id, requirement_code, heard_on, tempo, passed)
      select s.id, s.school_id, s.grade, v.id, 'X-KEEP', '2026-12-01', 60, true
      from students s, (select id from ladder_versions order by id limit 1) v where s.status = 'active' order by s.id limit 1`);
    const before = await readRosterBefore(app.database);
    const expected = expectedStart(before, next.startsOn);
    const passOffsBefore = await query<{
      id: number;
      student_id: number;
      grade: number;
      heard_on: string;
    }>('select id, student_id, grade, heard_on::text from pass_offs order by id');
    const rungsBefore = await query<{ student_id: number; rung: number }>(
      'select student_id, rung from student_attainment order by student_id',
    );
    const loansBefore = await query<object>('select * from loans order by id');
    const oldYearSeats = await query<object>(
      `select * from enrollments where school_year_id = ${before.currentYear.id} order by id`,
    );

    const preview = await coordinator.post('/api/school-years/start/preview', next);
    expect(preview.status).toBe(200);
    expect(preview.body).toMatchObject({
      ...expected.counts,
      committed: false,
      year: '2027-28',
      fromYear: '2026-27',
    });
    expect(expected.counts.leaving).toBeGreaterThan(0);
    expect(expected.counts.graduated).toBeGreaterThan(0);
    expect(expected.counts.movingUp).toBeGreaterThan(0);
    expect(expected.counts.loansDueBack).toBeGreaterThan(0);
    // The preview names every student it cannot place, school by school counts add up.
    const leavingIds = [...expected.outcomes]
      .filter(([, row]) => row.outcome === 'leaving')
      .map(([id]) => id)
      .sort((a, b) => a - b);
    expect(
      preview.body.unplaced
        .map((row: { studentId: number }) => row.studentId)
        .sort((a: number, b: number) => a - b),
    ).toEqual(leavingIds);
    expect(
      preview.body.schools.reduce(
        (sum: number, row: { movingUp: number }) => sum + row.movingUp,
        0,
      ),
    ).toBe(expected.counts.movingUp);
    expect(preview.body.dueBack).toHaveLength(expected.counts.loansDueBack);

    const started = await coordinator.post('/api/school-years/start', {
      ...next,
      basis: preview.body.basis,
    });
    expect(started.status, JSON.stringify(started.body)).toBe(201);
    expect(started.body).toMatchObject({ ...expected.counts, committed: true });

    // Each student where the rules put them.
    const after = await query<{ id: number; school_id: number; grade: number; status: string }>(
      'select id, school_id, grade, status from students',
    );
    for (const row of after) {
      const planned = expected.outcomes.get(row.id);
      const was = before.students.find((student) => student.id === row.id)!;
      if (!planned)
        expect({ school: row.school_id, grade: row.grade, status: row.status }).toEqual({
          school: was.schoolId,
          grade: was.grade,
          status: was.status,
        });
      else
        expect({ school: row.school_id, grade: row.grade, status: row.status }).toEqual({
          school: planned.schoolId,
          grade: planned.grade,
          status: planned.status,
        });
    }
    // The new year is current, the old one is history with a row per student.
    const years = (await coordinator.get('/api/school-years')).body.rows as {
      name: string;
      current: boolean;
      past: boolean;
    }[];
    expect(years.filter((year) => year.current).map((year) => year.name)).toEqual(['2027-28']);
    expect(years.find((year) => year.name === '2026-27')).toMatchObject({
      current: false,
      past: true,
    });
    const [history] = await query<{ count: number }>(
      `select count(*)::int as count from student_years where school_year_id = ${before.currentYear.id} and outcome <> 'withdrawn'`,
    );
    expect(history!.count).toBe(expected.counts.students);
    // Seats: the continuing students' seats are in the new year; the old year's are untouched.
    expect(await seatsOfYear(app.database, '2027-28')).toEqual(carriedSeatPairs(expected));
    expect(
      await query(
        `select * from enrollments where school_year_id = ${before.currentYear.id} order by id`,
      ),
    ).toEqual(oldYearSeats);
    // Pass-offs, rungs and loans carry over untouched.
    expect(
      await query('select id, student_id, grade, heard_on::text from pass_offs order by id'),
    ).toEqual(passOffsBefore);
    expect(await query('select * from loans order by id')).toEqual(loansBefore);
    const rungsAfter = await query<{ student_id: number; rung: number }>(
      'select student_id, rung from student_attainment order by student_id',
    );
    expect(rungsAfter.map((row) => row.rung)).toEqual(rungsBefore.map((row) => row.rung));
    // The summaries follow the students: the school head counts and the Overview's copy.
    expect(await studentCountDrift(app.database.db)).toEqual([]);
    const [copy] = await query<{ drift: number }>(
      `select count(*)::int as drift from students s join student_attainment a on a.student_id = s.id where a.grade <> s.grade or a.school_id <> s.school_id or a.active <> (s.status = 'active')`,
    );
    expect(copy!.drift).toBe(0);
    // A graduate keeps their history and is off the active roster lists.
    const graduateId = [...expected.outcomes].find(([, row]) => row.outcome === 'graduated')![0];
    const [{ student_number: number }] = (await query<{ student_number: string }>(
      `select student_number from students where id = ${graduateId}`,
    )) as [{ student_number: string }];
    expect((await coordinator.get(`/api/students?status=active&q=${number}`)).body.total).toBe(0);
    const kept = await coordinator.get(`/api/students/${graduateId}`);
    expect(kept.status).toBe(200);
    expect(kept.body.status).toBe('graduated');
    // A student's page lists their past years: school, grade, ensembles and rung at its end.
    const movedId = [...expected.outcomes].find(
      ([id, row]) =>
        row.outcome === 'moving-up' &&
        before.seats.some(
          (seat) => seat.studentId === id && seat.active && seat.yearId === before.currentYear.id,
        ),
    )![0];
    const moved = await coordinator.get(`/api/students/${movedId}`);
    const was = before.students.find((row) => row.id === movedId)!;
    const oldEnsembles = await query<{ name: string }>(
      `select e.name from enrollments en join ensembles e on e.id = en.ensemble_id where en.student_id = ${movedId} and en.school_year_id = ${before.currentYear.id} and en.active order by e.name`,
    );
    expect(
      moved.body.years.filter(
        (entry: { schoolYearId: number }) => entry.schoolYearId === before.currentYear.id,
      ),
    ).toEqual([
      {
        schoolYearId: before.currentYear.id,
        year: '2026-27',
        schoolCode: before.schools.find((school) => school.id === was.schoolId)!.code,
        schoolName: expect.any(String),
        grade: was.grade,
        outcome: 'moving-up',
        ensembles: oldEnsembles.map((row) => row.name),
        rung: rungsBefore.find((row) => row.student_id === movedId)!.rung,
      },
    ]);
    expect(moved.body.enrollments).toEqual([]);
  });

  it('should refuse to start the same year twice, and put a later roster import into the new year', async () => {
    const before = await footprint();
    const again = await coordinator.post('/api/school-years/start', next);
    expect(again.status).toBe(400);
    expect(again.body.error.message).toContain('already exists');
    expect(await footprint()).toEqual(before);
    const header =
      'student_id,first_name,last_name,preferred_name,grade,school_code,ensemble,instrument,guardian_name,guardian_email';
    const file = Buffer.from(
      `${header}\r\n990002,Ash,Penhallow,,9,TRHS,Concert Band,trumpet,,\r\n`,
    );
    const uploaded = await coordinator.upload(
      '/api/imports/preview',
      'file',
      file,
      'after-start.csv',
    );
    const imported = await coordinator.post('/api/imports/commit', {
      importToken: uploaded.body.importToken,
      withdrawMissing: false,
      skipInvalid: false,
    });
    expect(imported.body.committed).toBe(true);
    const seats = await query<{ year: string }>(
      `select y.name as year from enrollments en join students s on s.id = en.student_id join school_years y on y.id = en.school_year_id where s.student_number = '990002'`,
    );
    expect(seats).toEqual([{ year: '2027-28' }]);
    // The old year is history: its seats are read, not changed.
    const [oldSeat] = await query<{ id: number; version: number }>(
      `select en.id, en.version from enrollments en join school_years y on y.id = en.school_year_id where y.name = '2026-27' limit 1`,
    );
    expect((await coordinator.get(`/api/enrollments/${oldSeat!.id}`)).status).toBe(200);
    const changed = await coordinator.patch(`/api/enrollments/${oldSeat!.id}`, {
      part: '2nd',
      version: oldSeat!.version,
    });
    expect(changed.status).toBe(409);
    expect(changed.body.error.message).toContain('2026-27, which is history');
    expect((await coordinator.delete(`/api/enrollments/${oldSeat!.id}`)).status).toBe(409);
    // A past year's students: that year's school, grade and seats, within the caller's schools.
    const [old] = await query<{ id: number }>(`select id from school_years where name = '2026-27'`);
    const [kept] = await query<{ count: number }>(
      `select count(*)::int as count from student_years where school_year_id = ${old!.id}`,
    );
    const listed = await coordinator.get(
      `/api/students?schoolYearId=${old!.id}&limit=5&sort=lastName:asc`,
    );
    expect(listed.status).toBe(200);
    expect(listed.body.total).toBe(kept!.count);
    const [mover] = await query<{ id: number; grade: number; code: string; number: string }>(
      `select sy.student_id as id, sy.grade, sc.code, s.student_number as number from student_years sy join schools sc on sc.id = sy.school_id join students s on s.id = sy.student_id where sy.school_year_id = ${old!.id} and sy.outcome = 'moving-up' order by sy.student_id limit 1`,
    );
    const found = await coordinator.get(`/api/students?schoolYearId=${old!.id}&q=${mover!.number}`);
    expect(found.body.rows).toHaveLength(1);
    expect(found.body.rows[0]).toMatchObject({
      id: mover!.id,
      grade: mover!.grade,
      schoolCode: mover!.code,
    });
    const hpmsEighth = await director.get(`/api/students?schoolYearId=${old!.id}&grade=8&limit=1`);
    const [counted] = await query<{ count: number }>(
      `select count(*)::int as count from student_years sy join schools sc on sc.id = sy.school_id where sy.school_year_id = ${old!.id} and sc.code = 'HPMS' and sy.grade = 8`,
    );
    expect(hpmsEighth.body.total).toBe(counted!.count);
    expect(hpmsEighth.body.rows[0].schoolCode).toBe('HPMS');
  });

  it('should carry the ensembles without their seats when the coordinator asks for empty ensembles', async () => {
    const following = {
      name: '2028-29',
      startsOn: '2028-08-14',
      endsOn: '2029-06-08',
      emptyEnsembles: true,
    };
    const preview = await coordinator.post('/api/school-years/start/preview', following);
    expect(preview.body.seats).toBe(0);
    expect(preview.body.ensembles).toBeGreaterThan(0);
    const started = await coordinator.post('/api/school-years/start', following);
    expect(started.status, JSON.stringify(started.body)).toBe(201);
    const [seats] = await query<{ count: number }>(
      `select count(*)::int as count from enrollments en join school_years y on y.id = en.school_year_id where y.name = '2028-29'`,
    );
    expect(seats!.count).toBe(0);
  });
});
