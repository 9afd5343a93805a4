import { describe, expect, it } from 'vitest';
import { keyFirstFrom } from '../../server/students/students-queries';
import { studentCountDrift } from '../support/student-counts';
import { useStudentsApp, type Row } from './roster-students-app';

const { app, coordinator, director, query, newStudent } = useStudentsApp();

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
