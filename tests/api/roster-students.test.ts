import { sql } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { rowsOf } from '../../server/db/client';
import { keyFirstFrom } from '../../server/students/students-queries';
import { studentCountDrift } from '../support/student-counts';
import { byRole, demoEmail, everyRole, useTestApp } from '../support/test-app';

interface Row {
  id: number;
  studentNumber: string;
  firstName: string;
  lastName: string;
  grade: number;
  gradeLabel: string;
  schoolId: number;
  schoolCode: string;
  status: string;
  ensembles: string;
  ensembleIds: number[];
  instruments: string;
  instrumentIds: string[];
  version: number;
  guardianEmail?: string | null;
}

async function query<Result>(text: string): Promise<Result[]> {
  return rowsOf<Result>(await app.database.db.execute(sql.raw(text)));
}

async function firstStudentOf(code: string): Promise<Row> {
  const response = await coordinator.get(`/api/students?schoolCode=${code}&status=active&limit=1`);
  return response.body.rows[0];
}

function newStudent(overrides: object = {}) {
  return {
    studentNumber: `T${Math.floor(Math.random() * 1e9)}`,
    firstName: 'Wilhelmina',
    lastName: 'Quorndon',
    grade: 7,
    schoolId: app.schoolIds['HPMS'],
    guardianName: 'Alex Quorndon',
    guardianEmail: 'alex.quorndon@families.merrowbasin.example',
    ...overrides,
  };
}

const app = useTestApp({ signIn: everyRole });
const { coordinator, director, otherDirector, viewer, technician, student } = byRole(app.clients);

describe('Students scoping', () => {
  it('should list only the director’s school when a director asks', async () => {
    const response = await director.get('/api/students?limit=1000');
    expect(response.status).toBe(200);
    const [{ total }] = await query<{ total: number }>(
      `select count(*)::int as total from students where school_id = ${app.schoolIds['HPMS']}`,
    );
    expect(response.body.total).toBe(total);
    expect(new Set(response.body.rows.map((row: Row) => row.schoolCode))).toEqual(
      new Set(['HPMS']),
    );
    expect(response.body.rows[0].guardianEmail).toMatch(/@families\.merrowbasin\.example$/);
  });

  it('should answer 404 and change nothing when a director reads or edits another school’s student', async () => {
    const quarryHill = await firstStudentOf('QHMS');
    expect((await director.get(`/api/students/${quarryHill.id}`)).status).toBe(404);
    const patch = await director.patch(`/api/students/${quarryHill.id}`, {
      firstName: 'Changed',
      version: quarryHill.version,
    });
    expect(patch.status).toBe(404);
    const move = await director.post(`/api/students/${quarryHill.id}/move`, {
      toSchoolId: app.schoolIds['HPMS'],
      version: quarryHill.version,
    });
    expect(move.status).toBe(404);
    const after = await coordinator.get(`/api/students/${quarryHill.id}`);
    expect(after.body.firstName).toBe(quarryHill.firstName);
    expect(after.body.schoolCode).toBe('QHMS');
  });

  it('should answer 404 when a director adds a student to another school', async () => {
    const response = await director.post(
      '/api/students',
      newStudent({ schoolId: app.schoolIds['QHMS'] }),
    );
    expect(response.status).toBe(404);
  });

  it('should let a viewer read their school without guardian details and refuse writes with 403', async () => {
    const list = await viewer.get('/api/students?limit=5');
    expect(list.status).toBe(200);
    expect(list.body.rows.every((row: Row) => row.schoolCode === 'TRHS')).toBe(true);
    expect(list.body.rows[0]).not.toHaveProperty('guardianEmail');
    expect(list.body.rows[0]).not.toHaveProperty('guardianName');
    const one = await viewer.get(`/api/students/${list.body.rows[0].id}`);
    expect(one.status).toBe(200);
    expect(one.body).not.toHaveProperty('guardianEmail');
    const patch = await viewer.patch(`/api/students/${list.body.rows[0].id}`, {
      firstName: 'Changed',
      version: list.body.rows[0].version,
    });
    expect(patch.status).toBe(403);
    expect(
      (await viewer.post('/api/students', newStudent({ schoolId: app.schoolIds['TRHS'] }))).status,
    ).toBe(403);
    const move = await viewer.post(`/api/students/${list.body.rows[0].id}/move`, {
      toSchoolId: app.schoolIds['HPMS'],
      version: list.body.rows[0].version,
    });
    expect(move.status).toBe(403);
  });

  it('should answer 403 when a technician asks for students', async () => {
    expect((await technician.get('/api/students')).status).toBe(403);
    const hpms = await firstStudentOf('HPMS');
    expect((await technician.get(`/api/students/${hpms.id}`)).status).toBe(403);
  });

  it('should let a student read only their own row', async () => {
    expect((await student.get('/api/students')).status).toBe(403);
    const [own] = await query<{ student_id: number }>(
      `select student_id from users where email = '${demoEmail('student.hpms')}'`,
    );
    const mine = await student.get(`/api/students/${own!.student_id}`);
    expect(mine.status).toBe(200);
    expect(mine.body.lastName).toBe('Arkwright-Lund');
    expect(mine.body).not.toHaveProperty('guardianEmail');
    const classmate = await query<{ id: number }>(
      `select id from students where school_id = ${app.schoolIds['HPMS']} and id <> ${own!.student_id} limit 1`,
    );
    expect((await student.get(`/api/students/${classmate[0]!.id}`)).status).toBe(404);
    const patch = await student.patch(`/api/students/${own!.student_id}`, {
      firstName: 'Changed',
      version: mine.body.version,
    });
    expect(patch.status).toBe(403);
  });

  it('should answer 401 without a session and work with a bearer token', async () => {
    expect((await app.anonymous.get('/api/students')).status).toBe(401);
    const script = app.bearer(await app.token(demoEmail('director.qhms')));
    const response = await script.get('/api/students?limit=3');
    expect(response.status).toBe(200);
    expect(response.body.rows.every((row: Row) => row.schoolCode === 'QHMS')).toBe(true);
  });
});

describe('Students list', () => {
  it('should find a student by first and last name prefixes and by student id', async () => {
    const byName = await coordinator.get('/api/students?q=toby%20arkw');
    expect(byName.body.rows.map((row: Row) => row.lastName)).toEqual(['Arkwright-Lund']);
    const toby = byName.body.rows[0] as Row;
    const byNumber = await coordinator.get(`/api/students?q=${toby.studentNumber}`);
    expect(byNumber.body.rows.map((row: Row) => row.id)).toEqual([toby.id]);
    const [preferred] = await query<{ id: number; preferred_name: string }>(
      `select id, preferred_name from students where preferred_name is not null order by id limit 1`,
    );
    const byPreferred = await coordinator.get(
      `/api/students?q=${encodeURIComponent(preferred!.preferred_name)}&limit=1000`,
    );
    expect(byPreferred.body.rows.map((row: Row) => row.id)).toContain(preferred!.id);
    const nobody = await coordinator.get('/api/students?q=zzqx');
    expect(nobody.body).toEqual({ rows: [], total: 0 });
  });

  it('should sort by last name by default and agree with the database order', async () => {
    const page = await coordinator.get('/api/students?limit=50');
    const expected = await query<{ id: number }>(
      'select id from students order by last_name, first_name, id limit 50',
    );
    expect(page.body.rows.map((row: Row) => row.id)).toEqual(expected.map((row) => row.id));
    const descending = await coordinator.get('/api/students?sort=lastName:desc&limit=50');
    const expectedDescending = await query<{ id: number }>(
      'select id from students order by last_name desc, first_name desc, id desc limit 50',
    );
    expect(descending.body.rows.map((row: Row) => row.id)).toEqual(
      expectedDescending.map((row) => row.id),
    );
  });

  it('should sort by every offered field, the id breaking ties', async () => {
    const orders: Record<string, string> = {
      firstName: 's.first_name, s.last_name, s.id',
      studentNumber: 's.student_number, s.id',
      grade: 's.grade, s.last_name, s.first_name, s.id',
      school: 'c.code, s.last_name, s.first_name, s.id',
      status: 's.status, s.last_name, s.first_name, s.id',
    };
    for (const [field, order] of Object.entries(orders)) {
      for (const direction of ['asc', 'desc']) {
        const response = await coordinator.get(`/api/students?sort=${field}:${direction}&limit=60`);
        expect(response.status).toBe(200);
        const sqlOrder = order
          .split(', ')
          .map((column) => `${column} ${direction}`)
          .join(', ');
        const expected = await query<{ id: number }>(
          `select s.id from students s join schools c on c.id = s.school_id order by ${sqlOrder} limit 60`,
        );
        expect(response.body.rows.map((row: Row) => row.id)).toEqual(expected.map((row) => row.id));
      }
    }
    const grades = (await coordinator.get('/api/students?sort=grade:desc&limit=400')).body.rows.map(
      (row: Row) => row.grade,
    );
    expect(grades).toEqual([...grades].sort((a, b) => b - a));
    const updated = await coordinator.get('/api/students?sort=updatedAt:desc&limit=1');
    expect(updated.status).toBe(200);
    const bad = await coordinator.get('/api/students?sort=guardianEmail:asc');
    expect(bad.status).toBe(400);
    expect(bad.body.error.fieldErrors[0].field).toBe('sort');
  });

  it('should filter by school, grade, status, ensemble and instrument', async () => {
    const quarry = await coordinator.get(`/api/students?schoolCode=qhms&limit=1000`);
    const bySchoolId = await coordinator.get(
      `/api/students?schoolId=${app.schoolIds['QHMS']}&limit=1`,
    );
    expect(quarry.body.total).toBe(bySchoolId.body.total);
    expect(quarry.body.rows.every((row: Row) => row.schoolCode === 'QHMS')).toBe(true);

    const seventh = await coordinator.get('/api/students?grade=7&limit=1000');
    expect(seventh.body.total).toBeGreaterThan(0);
    expect(seventh.body.rows.every((row: Row) => row.grade === 7 && row.gradeLabel === '7')).toBe(
      true,
    );

    const withdrawn = await coordinator.get('/api/students?status=withdrawn&limit=1000');
    const [{ total: withdrawnTotal }] = await query<{ total: number }>(
      "select count(*)::int as total from students where status = 'withdrawn'",
    );
    expect(withdrawn.body.total).toBe(withdrawnTotal);

    const ensembles = await coordinator.get(
      `/api/ensembles?schoolId=${app.schoolIds['HPMS']}&sort=memberCount:desc`,
    );
    const biggest = ensembles.body.rows[0];
    const members = await coordinator.get(`/api/students?ensembleId=${biggest.id}&limit=1000`);
    expect(members.body.total).toBe(biggest.memberCount);
    expect(members.body.rows.every((row: Row) => row.ensembleIds.includes(biggest.id))).toBe(true);
    expect(members.body.rows[0].ensembles).toContain(biggest.name);

    const tubas = await coordinator.get('/api/students?instrumentId=tuba&limit=1000');
    expect(tubas.body.total).toBeGreaterThan(0);
    expect(tubas.body.rows.every((row: Row) => row.instrumentIds.includes('tuba'))).toBe(true);
    expect(tubas.body.rows[0].instruments).toContain('Tuba');

    const combined = await director.get(`/api/students?grade=7&instrumentId=trumpet&limit=1000`);
    expect(
      combined.body.rows.every(
        (row: Row) =>
          row.grade === 7 && row.instrumentIds.includes('trumpet') && row.schoolCode === 'HPMS',
      ),
    ).toBe(true);
    const badGrade = await coordinator.get('/api/students?grade=13');
    expect(badGrade.status).toBe(400);
    expect(badGrade.body.error.fieldErrors[0].field).toBe('grade');
  });

  it('should page with offset and limit over the same order', async () => {
    const whole = await coordinator.get('/api/students?sort=grade:asc&limit=30');
    const page = await coordinator.get('/api/students?sort=grade:asc&limit=10&offset=10');
    expect(page.body.rows).toHaveLength(10);
    expect(page.body.total).toBe(whole.body.total);
    expect(page.body.rows.map((row: Row) => row.id)).toEqual(
      whole.body.rows.slice(10, 20).map((row: Row) => row.id),
    );
    expect((await coordinator.get('/api/students?limit=5000')).status).toBe(400);
  });

  it('should answer the database order on pages past the middle, which are read from the far end', async () => {
    const [{ total }] = await query<{ total: number }>(
      'select count(*)::int as total from students',
    );
    // Pages from keyFirstFrom rows in find their first row's key first (the middle ones here).
    expect(Math.floor(total / 2) - 40).toBeGreaterThan(keyFirstFrom);
    const orders: Record<string, string> = {
      'lastName:asc': 's.last_name, s.first_name, s.id',
      'grade:desc': 's.grade desc, s.last_name desc, s.first_name desc, s.id desc',
      'school:asc': 'c.code, s.last_name, s.first_name, s.id',
      'updatedAt:desc': 's.updated_at desc, s.id desc',
      'studentNumber:asc': 's.student_number, s.id',
    };
    for (const [sort, order] of Object.entries(orders)) {
      // Just before the middle, across it, just past it, and the last rows (a short page).
      for (const offset of [
        Math.floor(total / 2) - 40,
        Math.floor(total / 2) - 10,
        total - 70,
        total - 13,
      ]) {
        const page = await coordinator.get(`/api/students?sort=${sort}&limit=25&offset=${offset}`);
        const expected = await query<{ id: number }>(
          `select s.id from students s join schools c on c.id = s.school_id order by ${order} limit 25 offset ${offset}`,
        );
        expect(page.body.total).toBe(total);
        expect(page.body.rows.map((row: Row) => row.id)).toEqual(expected.map((row) => row.id));
      }
    }
    const beyond = await coordinator.get(`/api/students?offset=${total}&limit=10`);
    expect(beyond.body).toEqual({ rows: [], total });
    // A filter applies to the key's search as to the page.
    const [{ active }] = await query<{ active: number }>(
      `select count(*)::int as active from students where status = 'active'`,
    );
    const offset = Math.floor(active / 2) - 30;
    const page = await coordinator.get(`/api/students?status=active&limit=20&offset=${offset}`);
    const expected = await query<{ id: number }>(
      `select id from students where status = 'active' order by last_name, first_name, id limit 20 offset ${offset}`,
    );
    expect(page.body.rows.map((row: Row) => row.id)).toEqual(expected.map((row) => row.id));
  });

  it('should walk every student page by page with the cursor in the Link header, in the database order', async () => {
    const orders: Record<string, string> = {
      'lastName:asc': 's.last_name, s.first_name, s.id',
      'grade:desc': 's.grade desc, s.last_name desc, s.first_name desc, s.id desc',
      'school:asc': 'c.code, s.last_name, s.first_name, s.id',
      'updatedAt:desc': 's.updated_at desc, s.id desc',
    };
    // Changes a tenth of a millisecond apart: the cursor must keep PostgreSQL's microseconds.
    await query(
      `update students set updated_at = timestamptz '2026-11-30 08:00:00.000100+00' + (id % 9) * interval '100 microseconds'`,
    );
    for (const [sort, order] of Object.entries(orders)) {
      const expected = await query<{ id: number }>(
        `select s.id from students s join schools c on c.id = s.school_id order by ${order}`,
      );
      const walked: number[] = [];
      let path: string | undefined = `/api/students?sort=${sort}&limit=400`;
      while (path) {
        const page = await coordinator.get(path);
        expect(page.status).toBe(200);
        expect(page.body.total).toBe(expected.length);
        walked.push(...page.body.rows.map((row: Row) => row.id));
        // RFC 8288: <target>; rel="next", only while a page is full.
        path = /^<([^>]+)>; rel="next"$/.exec(page.headers['link'] ?? '')?.[1];
        if (path) expect(new URL(path, 'http://x').searchParams.get('sort')).toBe(sort);
      }
      expect(walked).toEqual(expected.map((row) => row.id));
    }
  });

  it('should keep a director’s cursor pages within their school, and refuse a forged or foreign cursor with 400', async () => {
    const first = await director.get('/api/students?limit=5');
    const link = /^<([^>]+)>; rel="next"$/.exec(first.headers['link'])![1]!;
    const after = new URL(link, 'http://x').searchParams.get('after')!;
    const second = await director.get(link);
    expect(second.body.rows.every((row: Row) => row.schoolCode === 'HPMS')).toBe(true);
    const expected = await query<{ id: number }>(
      `select id from students where school_id = ${app.schoolIds['HPMS']} order by last_name, first_name, id limit 5 offset 5`,
    );
    expect(second.body.rows.map((row: Row) => row.id)).toEqual(expected.map((row) => row.id));
    const otherSort = await director.get(`/api/students?sort=grade:asc&after=${after}`);
    expect(otherSort.status).toBe(400);
    expect(otherSort.body.error.fieldErrors[0]).toMatchObject({ field: 'after' });
    const forged = Buffer.from(JSON.stringify({ sort: 'lastName:asc', key: ['x', 1] })).toString(
      'base64url',
    );
    for (const cursor of [forged, 'not-a-cursor', '%27%3B--']) {
      const bad = await director.get(`/api/students?after=${cursor}`);
      expect(bad.status).toBe(400);
      expect(bad.body.error.fieldErrors[0].field).toBe('after');
    }
  });

  it('should answer a search page in the database order, whether the matches are few or many', async () => {
    // 'a' matches most of the demo district; 'ro' a few dozen students.
    for (const word of ['a', 'ro']) {
      const condition = `lower(student_number) like '${word}%' or lower(last_name) like '${word}%' or lower(first_name) like '${word}%' or lower(preferred_name) like '${word}%'`;
      const expected = await query<{ id: number }>(
        `select id from students where ${condition} order by last_name, first_name, id limit 40 offset 5`,
      );
      const [{ total }] = await query<{ total: number }>(
        `select count(*)::int as total from students where ${condition}`,
      );
      const page = await coordinator.get(`/api/students?q=${word}&limit=40&offset=5`);
      expect(page.body.total).toBe(total);
      expect(page.body.rows.map((row: Row) => row.id)).toEqual(expected.map((row) => row.id));
    }
  });

  it('should keep the per-school counts behind list totals exact through adds, edits and moves', async () => {
    const drift = () => studentCountDrift(app.database.db);
    expect(await drift()).toEqual([]);
    const created = await coordinator.post('/api/students', newStudent({ grade: 8 }));
    expect(created.status).toBe(201);
    const changed = await coordinator.patch(`/api/students/${created.body.id}`, {
      version: created.body.version,
      grade: 9,
      status: 'withdrawn',
    });
    expect(changed.status).toBe(200);
    expect(await drift()).toEqual([]);
    const [{ total }] = await query<{ total: number }>(
      `select count(*)::int as total from students where school_id = ${app.schoolIds['HPMS']} and grade = 9 and status = 'withdrawn'`,
    );
    const listed = await coordinator.get(
      `/api/students?schoolId=${app.schoolIds['HPMS']}&grade=9&status=withdrawn&limit=1`,
    );
    expect(listed.body.total).toBe(total);
  });
});

describe('Students changes', () => {
  it('should create a student, show kindergarten as K and record who did it', async () => {
    const created = await director.post('/api/students', newStudent({ grade: 'K' }));
    expect(created.status).toBe(201);
    expect(created.body).toMatchObject({
      grade: 0,
      gradeLabel: 'K',
      schoolCode: 'HPMS',
      status: 'active',
      version: 1,
    });
    expect(created.body.enrollments).toEqual([]);
    expect(created.body.moves).toEqual([]);
    const audit = await query<{ action: string; email: string; after: { lastName: string } }>(
      `select a.action, u.email, a.after from audit_log a join users u on u.id = a.user_id
       where a.entity = 'student' and a.entity_id = '${Number(created.body.id)}'`,
    );
    expect(audit.map((row) => [row.action, row.email])).toEqual([
      ['create', demoEmail('director.hpms')],
    ]);
    expect(audit[0]!.after.lastName).toBe('Quorndon');
  });

  it('should answer 400 with every field error and create nothing when the input is bad', async () => {
    const before = await query<{ total: number }>('select count(*)::int as total from students');
    const response = await coordinator.post('/api/students', {
      studentNumber: 'has spaces!',
      firstName: '',
      grade: 14,
      schoolId: app.schoolIds['HPMS'],
      guardianEmail: 'not-an-address',
    });
    expect(response.status).toBe(400);
    const fields = response.body.error.fieldErrors.map((error: { field: string }) => error.field);
    expect(fields).toEqual(
      expect.arrayContaining(['studentNumber', 'firstName', 'lastName', 'grade', 'guardianEmail']),
    );
    const existing = await firstStudentOf('HPMS');
    const duplicate = await coordinator.post(
      '/api/students',
      newStudent({ studentNumber: existing.studentNumber }),
    );
    expect(duplicate.status).toBe(400);
    expect(duplicate.body.error.fieldErrors[0].field).toBe('studentNumber');
    const after = await query<{ total: number }>('select count(*)::int as total from students');
    expect(after).toEqual(before);
  });

  it('should change a student, bump the version and answer 409 on a stale version', async () => {
    const created = await coordinator.post('/api/students', newStudent());
    const first = await director.patch(`/api/students/${created.body.id}`, {
      preferredName: 'Mina',
      grade: 8,
      version: created.body.version,
    });
    expect(first.status).toBe(200);
    expect(first.body).toMatchObject({
      preferredName: 'Mina',
      grade: 8,
      version: created.body.version + 1,
    });
    const stale = await director.patch(`/api/students/${created.body.id}`, {
      preferredName: 'Overwritten',
      version: created.body.version,
    });
    expect(stale.status).toBe(409);
    expect((await coordinator.get(`/api/students/${created.body.id}`)).body.preferredName).toBe(
      'Mina',
    );
    const audit = await query<{
      action: string;
      before: { grade: number };
      after: { grade: number };
    }>(
      `select action, before, after from audit_log where entity = 'student' and entity_id = '${Number(created.body.id)}' and action = 'update'`,
    );
    expect(audit).toHaveLength(1);
    expect([audit[0]!.before.grade, audit[0]!.after.grade]).toEqual([7, 8]);
  });

  it('should end a student’s seats when they withdraw, keeping the rows for the history', async () => {
    const seated = await director.get('/api/students?status=active&instrumentId=clarinet&limit=1');
    const leaver = (await director.get(`/api/students/${seated.body.rows[0].id}`)).body;
    const seatIds = leaver.enrollments.map((seat: { id: number }) => seat.id);
    expect(seatIds.length).toBeGreaterThan(0);
    const withdrawn = await director.patch(`/api/students/${leaver.id}`, {
      status: 'withdrawn',
      version: leaver.version,
    });
    expect(withdrawn.status).toBe(200);
    expect(withdrawn.body.enrollments).toEqual([]);
    const rows = rowsOf<{ id: number; active: boolean }>(
      await app.database.db.execute(
        sql`select id, active from enrollments where student_id = ${leaver.id} order by id`,
      ),
    );
    expect(rows.filter((row) => seatIds.includes(row.id)).map((row) => row.active)).toEqual(
      seatIds.map(() => false),
    );
  });

  it('should withdraw a student with a PATCH and offer no DELETE', async () => {
    const created = await coordinator.post('/api/students', newStudent());
    const withdrawn = await director.patch(`/api/students/${created.body.id}`, {
      status: 'withdrawn',
      version: created.body.version,
    });
    expect(withdrawn.status).toBe(200);
    expect(withdrawn.body.status).toBe('withdrawn');
    expect((await coordinator.delete(`/api/students/${created.body.id}`)).status).toBe(404);
    expect((await coordinator.get(`/api/students/${created.body.id}`)).status).toBe(200);
  });

  it('should refuse a change of school through PATCH', async () => {
    const created = await coordinator.post('/api/students', newStudent());
    const response = await coordinator.patch(`/api/students/${created.body.id}`, {
      schoolId: app.schoolIds['QHMS'],
      version: created.body.version,
    });
    expect(response.status).toBe(400);
    expect(response.body.error.fieldErrors[0].field).toBe('schoolId');
    expect((await coordinator.get(`/api/students/${created.body.id}`)).body.schoolCode).toBe(
      'HPMS',
    );
  });
});

describe('Students move', () => {
  it('should move a student between schools, end their old seats and keep their history', async () => {
    const seated = await director.get('/api/students?status=active&instrumentId=flute&limit=1');
    const mover = (await coordinator.get(`/api/students/${seated.body.rows[0].id}`)).body;
    expect(mover.enrollments.length).toBeGreaterThan(0);
    const oldSeatIds: number[] = mover.enrollments
      .map((seat: { id: number }) => seat.id)
      .sort((a: number, b: number) => a - b);

    const refused = await director.post(`/api/students/${mover.id}/move`, {
      toSchoolId: app.schoolIds['QHMS'],
      version: mover.version,
    });
    expect(refused.status).toBe(404);

    const stale = await coordinator.post(`/api/students/${mover.id}/move`, {
      toSchoolId: app.schoolIds['QHMS'],
      version: mover.version - 1,
    });
    expect(stale.status).toBe(409);

    const moved = await coordinator.post(`/api/students/${mover.id}/move`, {
      toSchoolId: app.schoolIds['QHMS'],
      version: mover.version,
    });
    expect(moved.status).toBe(200);
    expect(moved.body).toMatchObject({
      id: mover.id,
      studentNumber: mover.studentNumber,
      schoolCode: 'QHMS',
    });
    expect(moved.body.enrollments).toEqual([]);
    expect(moved.body.ensembles).toBe('');
    expect(moved.body.moves).toHaveLength(1);
    expect(moved.body.moves[0]).toMatchObject({
      fromSchool: { code: 'HPMS' },
      toSchool: { code: 'QHMS' },
      movedByName: 'Renata Okonkwo-Hale',
    });

    const ended = await coordinator.get(`/api/enrollments?studentId=${mover.id}&active=false`);
    expect(
      ended.body.rows.map((seat: { id: number }) => seat.id).sort((a: number, b: number) => a - b),
    ).toEqual(oldSeatIds);
    expect(
      ended.body.rows.every((seat: { schoolCode: string }) => seat.schoolCode === 'HPMS'),
    ).toBe(true);

    expect((await director.get(`/api/students/${mover.id}`)).status).toBe(404);
    expect((await otherDirector.get(`/api/students/${mover.id}`)).status).toBe(200);

    const audit = await query<{ action: string; entity: string }>(
      `select action, entity from audit_log where (entity = 'student' and entity_id = '${Number(mover.id)}')
       or (entity = 'enrollment' and entity_id in (${oldSeatIds.map((seatId: number) => `'${Number(seatId)}'`).join(',')})) order by id`,
    );
    expect(audit).toEqual([
      { action: 'move', entity: 'student' },
      ...oldSeatIds.map(() => ({ action: 'update', entity: 'enrollment' })),
    ]);
  });

  it('should answer 400 when the student is already at that school or the school is unknown', async () => {
    const hpms = await firstStudentOf('HPMS');
    const same = await coordinator.post(`/api/students/${hpms.id}/move`, {
      toSchoolId: app.schoolIds['HPMS'],
      version: hpms.version,
    });
    expect(same.status).toBe(400);
    const unknown = await coordinator.post(`/api/students/${hpms.id}/move`, {
      toSchoolId: 999_999,
      version: hpms.version,
    });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.fieldErrors[0].field).toBe('toSchoolId');
    const missing = await coordinator.post(`/api/students/${hpms.id}/move`, {
      version: hpms.version,
    });
    expect(missing.status).toBe(400);
    expect((await coordinator.get(`/api/students/${hpms.id}`)).body.schoolCode).toBe('HPMS');
  });
});
