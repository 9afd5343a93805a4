import { sql } from 'drizzle-orm';
import { beforeAll, describe, expect, it } from 'vitest';
import { rowsOf } from '../../server/db/client';
import { demoEmail, useTestApp, byRole, everyRole, type SignedInClient } from '../support/test-app';

interface Seat {
  id: number;
  studentId: number;
  ensembleId: number;
  schoolCode: string;
  schoolYearId: number;
  instrumentId: string | null;
  instrumentName: string | null;
  part: string;
  chair: number | null;
  active: boolean;
  version: number;
}

let jazzLabId: number;

async function query<Result>(text: string): Promise<Result[]> {
  return rowsOf<Result>(await app.database.db.execute(sql.raw(text)));
}

async function seatCount(): Promise<number> {
  const [row] = await query<{ total: number }>('select count(*)::int as total from enrollments');
  return row!.total;
}

async function activeStudentOf(code: string, offset = 0) {
  const response = await coordinator.get(
    `/api/students?schoolCode=${code}&status=active&sort=studentNumber:asc&limit=1&offset=${offset}`,
  );
  return response.body.rows[0] as { id: number; version: number; firstName: string };
}

const app = useTestApp({ signIn: everyRole });
const { coordinator, director, technician, viewer, student } = byRole(app.clients);
beforeAll(async () => {
  const jazzLab = await director.post('/api/ensembles', {
    schoolId: app.schoolIds['HPMS'],
    name: 'Jazz Lab',
    kind: 'jazz-band',
  });
  jazzLabId = jazzLab.body.id;
});

/** Seats a student as `client`: `POST /api/enrollments` with the student, ensemble and instrument, and any more fields. */
const seatStudent = (
  client: SignedInClient,
  studentId: number,
  ensembleId: number,
  instrumentId: string,
  more: object = {},
) => client.post('/api/enrollments', { studentId, ensembleId, instrumentId, ...more });

describe('Enrollments', () => {
  it('should list seats of the director’s school only, with filters', async () => {
    const all = await director.get('/api/enrollments?limit=1000');
    expect(all.status).toBe(200);
    expect(all.body.total).toBeGreaterThan(100);
    expect(all.body.rows.every((seat: Seat) => seat.schoolCode === 'HPMS')).toBe(true);
    const ensembleId = all.body.rows[0].ensembleId;
    const oneEnsemble = await director.get(`/api/enrollments?ensembleId=${ensembleId}&limit=1000`);
    const [{ total }] = await query<{ total: number }>(
      `select count(*)::int as total from enrollments where ensemble_id = ${Number(ensembleId)}`,
    );
    expect(oneEnsemble.body.total).toBe(total);
    expect(oneEnsemble.body.rows[0].instrumentName).toEqual(expect.any(String));
    const studentId = all.body.rows[0].studentId;
    const oneStudent = await director.get(`/api/enrollments?studentId=${studentId}`);
    expect(oneStudent.body.rows.every((seat: Seat) => seat.studentId === studentId)).toBe(true);
    // The demo holds two years: the year filter answers that year's seats of the school.
    const yearId = Number(all.body.rows[0].schoolYearId);
    const year = await director.get(`/api/enrollments?schoolYearId=${yearId}&limit=1`);
    const [{ inYear }] = await query<{ inYear: number }>(
      `select count(*)::int as "inYear" from enrollments e join ensembles en on en.id = e.ensemble_id
       join schools sc on sc.id = en.school_id where sc.code = 'HPMS' and e.school_year_id = ${yearId}`,
    );
    expect(year.body.total).toBe(inYear);
    expect(year.body.total).toBeLessThan(all.body.total);
    // The demo's inactive seats are those of the few students who dropped this year.
    const inactive = await director.get('/api/enrollments?active=false&limit=100');
    const [{ dropped }] = await query<{ dropped: number }>(
      `select count(*)::int as dropped from enrollments e join students s on s.id = e.student_id
       join schools sc on sc.id = s.school_id where sc.code = 'HPMS' and not e.active and s.status = 'withdrawn'`,
    );
    expect(dropped).toBeGreaterThan(0);
    expect(inactive.body.total).toBe(dropped);
    const quarry = await coordinator.get(
      `/api/ensembles?schoolId=${app.schoolIds['QHMS']}&limit=1`,
    );
    const elsewhere = await director.get(`/api/enrollments?ensembleId=${quarry.body.rows[0].id}`);
    expect(elsewhere.body).toEqual({ rows: [], total: 0 });
    const sorted = await director.get('/api/enrollments?sort=chair:desc&limit=50');
    const chairs = sorted.body.rows.map((seat: Seat) => seat.chair);
    expect(chairs).toEqual([...chairs].sort((a, b) => b - a));
    expect((await director.get('/api/enrollments?active=maybe')).status).toBe(400);
  });

  it('should answer 403 to the technician and the student, and to a viewer’s writes', async () => {
    expect((await technician.get('/api/enrollments')).status).toBe(403);
    expect((await student.get('/api/enrollments')).status).toBe(403);
    const seats = await viewer.get('/api/enrollments?limit=1');
    expect(seats.status).toBe(200);
    const seat = seats.body.rows[0] as Seat;
    expect(seat.schoolCode).toBe('TRHS');
    expect(
      (await viewer.patch(`/api/enrollments/${seat.id}`, { chair: 1, version: seat.version }))
        .status,
    ).toBe(403);
    expect((await viewer.delete(`/api/enrollments/${seat.id}`)).status).toBe(403);
    const trhsStudent = await activeStudentOf('TRHS');
    const post = await seatStudent(viewer, trhsStudent.id, seat.ensembleId, 'flute');
    expect(post.status).toBe(403);
  });

  it('should seat a student for the current year, change the seat and answer 409 when stale', async () => {
    const hpmsStudent = await activeStudentOf('HPMS', 3);
    const created = await seatStudent(director, hpmsStudent.id, jazzLabId, 'tenor-sax', {
      part: 'Tenor 1',
      chair: 1,
    });
    expect(created.status).toBe(201);
    expect(created.body).toMatchObject({
      studentId: hpmsStudent.id,
      ensembleId: jazzLabId,
      ensembleName: 'Jazz Lab',
      schoolYearName: '2026-27',
      instrumentId: 'tenor-sax',
      instrumentName: 'Tenor Saxophone',
      active: true,
      version: 1,
    });
    const detail = await director.get(`/api/students/${hpmsStudent.id}`);
    expect(detail.body.ensembles).toContain('Jazz Lab');
    expect(detail.body.instrumentIds).toContain('tenor-sax');

    const changed = await director.patch(`/api/enrollments/${created.body.id}`, {
      chair: 2,
      part: 'Tenor 2',
      version: 1,
    });
    expect(changed.status).toBe(200);
    expect(changed.body).toMatchObject({ chair: 2, part: 'Tenor 2', version: 2 });
    const stale = await director.patch(`/api/enrollments/${created.body.id}`, {
      chair: 5,
      version: 1,
    });
    expect(stale.status).toBe(409);
    const badChair = await director.patch(`/api/enrollments/${created.body.id}`, {
      chair: 0,
      version: 2,
    });
    expect(badChair.status).toBe(400);
    expect(badChair.body.error.fieldErrors[0].field).toBe('chair');
    const ended = await director.patch(`/api/enrollments/${created.body.id}`, {
      active: false,
      version: 2,
    });
    expect(ended.body.active).toBe(false);
    expect((await director.get(`/api/enrollments/${created.body.id}`)).body.chair).toBe(2);

    const again = await seatStudent(director, hpmsStudent.id, jazzLabId, 'tenor-sax');
    expect(again.status).toBe(400);
    expect(again.body.error.fieldErrors[0].field).toBe('ensembleId');

    expect((await director.delete(`/api/enrollments/${created.body.id}`)).status).toBe(204);
    expect((await director.get(`/api/enrollments/${created.body.id}`)).status).toBe(404);
    const audit = await query<{ action: string; email: string }>(
      `select a.action, u.email from audit_log a join users u on u.id = a.user_id
       where a.entity = 'enrollment' and a.entity_id = '${Number(created.body.id)}' order by a.id`,
    );
    expect(audit.map((row) => row.action)).toEqual(['create', 'update', 'update', 'delete']);
    expect(audit[0]!.email).toBe(demoEmail('director.hpms'));
  });

  it('should answer 400 with the field and seat nobody when the instrument is not a known id', async () => {
    const before = await seatCount();
    const hpmsStudent = await activeStudentOf('HPMS', 4);
    const response = await seatStudent(director, hpmsStudent.id, jazzLabId, 'kazoo', {
      chair: 'first',
    });
    expect(response.status).toBe(400);
    expect(response.body.error.fieldErrors.map((error: { field: string }) => error.field)).toEqual(
      expect.arrayContaining(['instrumentId', 'chair']),
    );
    const missing = await director.post('/api/enrollments', { ensembleId: jazzLabId });
    expect(missing.body.error.fieldErrors.map((error: { field: string }) => error.field)).toEqual(
      expect.arrayContaining(['studentId', 'instrumentId']),
    );
    expect(await seatCount()).toBe(before);
  });

  it('should refuse a seat across schools or outside the director’s schools', async () => {
    const before = await seatCount();
    const quarryStudent = await activeStudentOf('QHMS');
    const acrossSchools = await seatStudent(coordinator, quarryStudent.id, jazzLabId, 'trumpet');
    expect(acrossSchools.status).toBe(400);
    expect(acrossSchools.body.error.fieldErrors[0].field).toBe('ensembleId');
    const outside = await seatStudent(director, quarryStudent.id, jazzLabId, 'trumpet');
    expect(outside.status).toBe(404);
    const quarrySeat = await coordinator.get(`/api/enrollments?studentId=${quarryStudent.id}`);
    const seat = quarrySeat.body.rows[0] as Seat;
    expect((await director.get(`/api/enrollments/${seat.id}`)).status).toBe(404);
    expect(
      (await director.patch(`/api/enrollments/${seat.id}`, { chair: 1, version: seat.version }))
        .status,
    ).toBe(404);
    expect((await director.delete(`/api/enrollments/${seat.id}`)).status).toBe(404);
    expect(await seatCount()).toBe(before);
  });

  it('should refuse to seat a withdrawn student', async () => {
    const hpmsStudent = await activeStudentOf('HPMS', 5);
    await director.patch(`/api/students/${hpmsStudent.id}`, {
      status: 'withdrawn',
      version: hpmsStudent.version,
    });
    const response = await seatStudent(director, hpmsStudent.id, jazzLabId, 'flute');
    expect(response.status).toBe(400);
    expect(response.body.error.fieldErrors[0].field).toBe('studentId');
  });
});
