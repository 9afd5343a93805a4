import { sql } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { demoEmail } from '../support/test-app';
import { rowsOf } from '../../server/db/client';
import { useStudentsApp } from './roster-students-app';

const { app, coordinator, director, otherDirector, query, firstStudentOf, newStudent } =
  useStudentsApp();

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
