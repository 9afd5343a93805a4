import { sql } from 'drizzle-orm';
import { beforeAll, describe, expect, it } from 'vitest';
import { rowsOf } from '../../server/db/client';
import { demoEmail, useTestApp, byRole, everyRole } from '../support/test-app';

interface Row {
  id: number;
  schoolId: number;
  schoolCode: string;
  name: string;
  kind: string;
  kindLabel: string;
  memberCount: number;
  version: number;
}

let userIds: Record<string, number>;

async function query<Result>(text: string): Promise<Result[]> {
  return rowsOf<Result>(await app.database.db.execute(sql.raw(text)));
}

const app = useTestApp({ signIn: everyRole });
const { coordinator, director, technician, viewer, student } = byRole(app.clients);
beforeAll(async () => {
  const users = await query<{ email: string; id: number }>('select id, email from users');
  userIds = Object.fromEntries(users.map((row) => [row.email.split('@')[0], row.id]));
});

describe('Ensembles', () => {
  it('should list only the director’s school’s ensembles with kind labels and member counts', async () => {
    const response = await director.get('/api/ensembles');
    expect(response.status).toBe(200);
    expect(response.body.total).toBe(4);
    expect(response.body.rows.every((row: Row) => row.schoolCode === 'HPMS')).toBe(true);
    const concert = response.body.rows.find((row: Row) => row.kind === 'concert-band');
    expect(concert.kindLabel).toBe('Concert band');
    const [{ seats }] = await query<{ seats: number }>(
      `select count(*)::int as seats from enrollments where ensemble_id = ${Number(concert.id)} and active
       and school_year_id = (select id from school_years where current)`,
    );
    expect(concert.memberCount).toBe(seats);
    expect(concert.directorName).toBe('Marcus Feldqvist');
  });

  it('should answer 404 for another school’s ensemble and 403 for roles without roster access', async () => {
    const quarry = await coordinator.get(
      `/api/ensembles?schoolId=${app.schoolIds['QHMS']}&limit=1`,
    );
    const id = quarry.body.rows[0].id;
    expect((await director.get(`/api/ensembles/${id}`)).status).toBe(404);
    expect(
      (await director.patch(`/api/ensembles/${id}`, { name: 'Renamed', version: 1 })).status,
    ).toBe(404);
    expect((await director.delete(`/api/ensembles/${id}`)).status).toBe(404);
    expect((await viewer.get(`/api/ensembles/${id}`)).status).toBe(404);
    expect((await technician.get('/api/ensembles')).status).toBe(403);
    expect((await student.get('/api/ensembles')).status).toBe(403);
    const trhs = await viewer.get('/api/ensembles');
    expect(trhs.body.rows.every((row: Row) => row.schoolCode === 'TRHS')).toBe(true);
    const write = await viewer.post('/api/ensembles', {
      schoolId: app.schoolIds['TRHS'],
      name: 'Jazz Lab',
      kind: 'jazz-band',
    });
    expect(write.status).toBe(403);
    expect((await viewer.delete(`/api/ensembles/${trhs.body.rows[0].id}`)).status).toBe(403);
    expect((await coordinator.get(`/api/ensembles/${id}`)).body.name).toBe(
      quarry.body.rows[0].name,
    );
  });

  it('should show an ensemble’s members in score order with their seats', async () => {
    const list = await director.get('/api/ensembles?sort=memberCount:desc');
    const biggest = list.body.rows[0];
    const detail = await director.get(`/api/ensembles/${biggest.id}`);
    expect(detail.status).toBe(200);
    expect(detail.body.school).toEqual({
      id: app.schoolIds['HPMS'],
      code: 'HPMS',
      name: 'Heron Point Middle',
    });
    expect(detail.body.members).toHaveLength(biggest.memberCount);
    const member = detail.body.members[0];
    expect(member).toMatchObject({
      studentId: expect.any(Number),
      enrollmentId: expect.any(Number),
    });
    expect(member.gradeLabel).toBe(String(member.grade));
    // Score order: woodwinds before brass before percussion before strings (common practice, no source).
    const families = ['flute', 'clarinet', 'alto-sax', 'trumpet', 'trombone', 'tuba'];
    const positions = detail.body.members
      .map((row: { instrumentId: string }) => families.indexOf(row.instrumentId))
      .filter((position: number) => position >= 0);
    expect(positions).toEqual([...positions].sort((a, b) => a - b));
  });

  it('should search by name, filter by kind and school, sort and page', async () => {
    const search = await coordinator.get('/api/ensembles?q=orchestra&limit=100');
    expect(search.body.total).toBeGreaterThan(0);
    expect(search.body.rows.every((row: Row) => /orchestra/i.test(row.name))).toBe(true);
    const marching = await coordinator.get('/api/ensembles?kind=marching-band');
    expect(marching.body.rows.map((row: Row) => row.schoolCode)).toEqual(['TRHS']);
    const bySchool = await coordinator.get('/api/ensembles?sort=school:desc&limit=100');
    const codes = bySchool.body.rows.map((row: Row) => row.schoolCode);
    expect(codes).toEqual([...codes].sort().reverse());
    const byCount = await coordinator.get('/api/ensembles?sort=memberCount:asc&limit=100');
    const counts = byCount.body.rows.map((row: Row) => row.memberCount);
    expect(counts).toEqual([...counts].sort((a, b) => a - b));
    const byKind = await coordinator.get('/api/ensembles?sort=kind:asc&limit=100');
    const kinds = byKind.body.rows.map((row: Row) => row.kind);
    expect(kinds).toEqual([...kinds].sort());
    const page = await coordinator.get('/api/ensembles?sort=name:asc&limit=3&offset=2');
    const all = await coordinator.get('/api/ensembles?sort=name:asc&limit=100');
    expect(page.body.rows.map((row: Row) => row.id)).toEqual(
      all.body.rows.slice(2, 5).map((row: Row) => row.id),
    );
    expect(page.body.total).toBe(all.body.total);
    const bad = await coordinator.get('/api/ensembles?sort=level:asc');
    expect(bad.status).toBe(400);
    expect((await coordinator.get('/api/ensembles?kind=choir')).status).toBe(400);
  });

  it('should create, change and delete an ensemble, answering 409 on a stale version', async () => {
    const created = await director.post('/api/ensembles', {
      schoolId: app.schoolIds['HPMS'],
      name: 'Jazz Lab',
      kind: 'jazz-band',
      meetingPeriod: 'Wed 15:30',
      directorUserId: userIds['director.hpms'],
    });
    expect(created.status).toBe(201);
    expect(created.body).toMatchObject({
      kindLabel: 'Jazz band',
      memberCount: 0,
      members: [],
      version: 1,
    });
    const changed = await director.patch(`/api/ensembles/${created.body.id}`, {
      level: 'advanced',
      version: 1,
    });
    expect(changed.status).toBe(200);
    expect(changed.body).toMatchObject({
      level: 'advanced',
      version: 2,
      meetingPeriod: 'Wed 15:30',
    });
    const stale = await director.patch(`/api/ensembles/${created.body.id}`, {
      level: 'beginning',
      version: 1,
    });
    expect(stale.status).toBe(409);
    expect((await director.get(`/api/ensembles/${created.body.id}`)).body.level).toBe('advanced');
    expect((await director.delete(`/api/ensembles/${created.body.id}`)).status).toBe(204);
    expect((await director.get(`/api/ensembles/${created.body.id}`)).status).toBe(404);
    const audit = await query<{ action: string; email: string }>(
      `select a.action, u.email from audit_log a join users u on u.id = a.user_id
       where a.entity = 'ensemble' and a.entity_id = '${Number(created.body.id)}' order by a.id`,
    );
    expect(audit.map((row) => row.action)).toEqual(['create', 'update', 'delete']);
    expect(new Set(audit.map((row) => row.email))).toEqual(new Set([demoEmail('director.hpms')]));
  });

  it('should answer 400 with field errors and create nothing when the input is bad', async () => {
    const before = await query<{ total: number }>('select count(*)::int as total from ensembles');
    const bad = await coordinator.post('/api/ensembles', {
      schoolId: app.schoolIds['HPMS'],
      name: '',
      kind: 'choir',
    });
    expect(bad.status).toBe(400);
    expect(bad.body.error.fieldErrors.map((error: { field: string }) => error.field)).toEqual(
      expect.arrayContaining(['name', 'kind']),
    );
    // A name the school already has, and a director of another school: each refused on its field.
    const hpms = { schoolId: app.schoolIds['HPMS'], kind: 'concert-band' };
    for (const [body, field] of [
      [{ ...hpms, name: 'Concert Band' }, 'name'],
      [
        { ...hpms, name: 'Flute Choir', directorUserId: userIds['director.qhms'] },
        'directorUserId',
      ],
    ] as const) {
      const answer = await coordinator.post('/api/ensembles', body);
      expect(answer.status, field).toBe(400);
      expect(answer.body.error.fieldErrors[0].field).toBe(field);
    }
    const elsewhere = await director.post('/api/ensembles', {
      schoolId: app.schoolIds['QHMS'],
      name: 'Flute Choir',
      kind: 'concert-band',
    });
    expect(elsewhere.status).toBe(404);
    expect(await query('select count(*)::int as total from ensembles')).toEqual(before);
  });

  it('should refuse to delete an ensemble that has enrollments, with a clear message', async () => {
    const list = await director.get('/api/ensembles?sort=memberCount:desc&limit=1');
    const ensemble = list.body.rows[0];
    const response = await director.delete(`/api/ensembles/${ensemble.id}`);
    expect(response.status).toBe(400);
    expect(response.body.error.message).toContain(ensemble.name);
    expect(response.body.error.message).toMatch(/enrollments/);
    expect((await director.get(`/api/ensembles/${ensemble.id}`)).status).toBe(200);
  });
});
