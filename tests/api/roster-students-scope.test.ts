import { describe, expect, it } from 'vitest';
import { demoEmail } from '../support/test-app';
import { useStudentsApp, type Row } from './roster-students-app';

const {
  app,
  coordinator,
  director,
  viewer,
  technician,
  student,
  query,
  firstStudentOf,
  newStudent,
} = useStudentsApp();

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
