import { describe, expect, it } from 'vitest';
import { useTestApp } from '../support/test-app';

const app = useTestApp({ signIn: ['coordinator', 'director.hpms', 'viewer.trhs'] });
const { coordinator, 'director.hpms': director, 'viewer.trhs': viewer } = app.clients;

/** Adds a school as the coordinator: `POST /api/schools` with its code, name and level, and any more fields. */
const addSchool = (code: string, name: string, level: string, more: object = {}) =>
  coordinator.post('/api/schools', { code, name, level, ...more });

describe('Schools', () => {
  it('should list only the director’s own schools when a director asks', async () => {
    const response = await director.get('/api/schools');
    expect(response.status).toBe(200);
    expect(response.body.total).toBe(1);
    expect(response.body.rows[0].code).toBe('HPMS');
    expect(response.body.rows[0].studentCount).toBeGreaterThan(100);
  });

  it('should answer 404 when a director opens another school', async () => {
    expect((await director.get(`/api/schools/${app.schoolIds['QHMS']}`)).status).toBe(404);
    expect((await director.get(`/api/schools/${app.schoolIds['HPMS']}`)).status).toBe(200);
  });

  it('should answer 403 when a director or viewer tries to change a school', async () => {
    const hpms = await director.get(`/api/schools/${app.schoolIds['HPMS']}`);
    const patch = { name: 'Renamed', version: hpms.body.version };
    expect((await director.patch(`/api/schools/${app.schoolIds['HPMS']}`, patch)).status).toBe(403);
    expect((await viewer.patch(`/api/schools/${app.schoolIds['TRHS']}`, patch)).status).toBe(403);
    expect(
      (await director.post('/api/schools', { code: 'NEW1', name: 'New School', level: 'middle' }))
        .status,
    ).toBe(403);
    const after = await coordinator.get(`/api/schools/${app.schoolIds['HPMS']}`);
    expect(after.body.name).toBe('Heron Point Middle');
  });

  it('should sort, filter and page with the list contract', async () => {
    const page = await coordinator.get('/api/schools?sort=code:desc&limit=2&offset=1');
    expect(page.body.total).toBeGreaterThanOrEqual(4);
    expect(page.body.rows).toHaveLength(2);
    const codes = (await coordinator.get('/api/schools?sort=code:desc&limit=100')).body.rows.map(
      (row: { code: string }) => row.code,
    );
    expect(page.body.rows.map((row: { code: string }) => row.code)).toEqual(codes.slice(1, 3));
    const middle = await coordinator.get('/api/schools?level=middle&q=quarry');
    expect(middle.body.rows.map((row: { code: string }) => row.code)).toEqual(['QHMS']);
    const bad = await coordinator.get('/api/schools?sort=password:asc');
    expect(bad.status).toBe(400);
    expect(bad.body.error.fieldErrors[0].field).toBe('sort');
  });

  it('should answer 400 with field errors and change nothing when the input is bad', async () => {
    const response = await addSchool('x', '', 'university');
    expect(response.status).toBe(400);
    const fields = response.body.error.fieldErrors.map((error: { field: string }) => error.field);
    expect(fields).toEqual(expect.arrayContaining(['code', 'name', 'level']));
    expect((await coordinator.get('/api/schools?code=X')).body.total).toBe(0);
  });

  it('should answer 409 when an edit starts from a stale version', async () => {
    const created = await addSchool('LKES', 'Larkmoor Elementary', 'elementary');
    expect(created.status).toBe(201);
    const id = created.body.id;
    const first = await coordinator.patch(`/api/schools/${id}`, {
      address: '3 Larkmoor Way',
      version: created.body.version,
    });
    expect(first.status).toBe(200);
    expect(first.body.version).toBe(created.body.version + 1);
    const stale = await coordinator.patch(`/api/schools/${id}`, {
      address: 'Overwritten',
      version: created.body.version,
    });
    expect(stale.status).toBe(409);
    expect((await coordinator.get(`/api/schools/${id}`)).body.address).toBe('3 Larkmoor Way');
    expect((await coordinator.delete(`/api/schools/${id}`)).status).toBe(204);
    expect((await coordinator.get(`/api/schools/${id}`)).status).toBe(404);
  });

  it('should record who changed a school in the audit log', async () => {
    const created = await addSchool('AUDT', 'Audit Test School', 'other');
    const result = await app.database.db.execute(
      `select a.action, u.email from audit_log a join users u on u.id = a.user_id where a.entity = 'school' and a.entity_id = '${Number(created.body.id)}'` as never,
    );
    expect((result as unknown as { rows: unknown[] }).rows).toEqual([
      { action: 'create', email: 'coordinator@merrowbasin.example' },
    ]);
  });

  it('should keep the grades served and the school students move up to, and refuse bad ones', async () => {
    const created = await addSchool('KVES', 'Kestrel Valley Elementary', 'elementary', {
      lowestGrade: 0,
      highestGrade: 5,
      sendsToSchoolId: app.schoolIds['HPMS'],
    });
    expect(created.status).toBe(201);
    expect(created.body).toMatchObject({
      lowestGrade: 0,
      highestGrade: 5,
      sendsToSchoolId: app.schoolIds['HPMS'],
      sendsTo: { id: app.schoolIds['HPMS'], code: 'HPMS', name: 'Heron Point Middle' },
      closedOn: null,
    });
    const upsideDown = await coordinator.patch(`/api/schools/${created.body.id}`, {
      version: created.body.version,
      lowestGrade: 6,
    });
    expect(upsideDown.status).toBe(400);
    expect(upsideDown.body.error.fieldErrors[0].field).toBe('highestGrade');
    const toItself = await coordinator.patch(`/api/schools/${created.body.id}`, {
      version: created.body.version,
      sendsToSchoolId: created.body.id,
    });
    expect(toItself.status).toBe(400);
    // A school sending its students nowhere known, and a grade past 12: both refused.
    for (const body of [
      { code: 'NOWH', name: 'Nowhere School', level: 'other', sendsToSchoolId: 999999 },
      { code: 'G13S', name: 'Grade Thirteen', level: 'high', highestGrade: 13 },
    ]) {
      expect((await coordinator.post('/api/schools', body)).status, body.code).toBe(400);
    }
    const unchanged = await coordinator.get(`/api/schools/${created.body.id}`);
    expect(unchanged.body.version).toBe(created.body.version);
    // A school another sends its students to is closed, not deleted.
    const target = await addSchool('TGTM', 'Target Middle', 'middle');
    await addSchool('FDRE', 'Feeder Elementary', 'elementary', { sendsToSchoolId: target.body.id });
    const deleted = await coordinator.delete(`/api/schools/${target.body.id}`);
    expect(deleted.status).toBe(400);
    expect(deleted.body.error.message).toContain(
      'Feeder Elementary sends its students on to Target Middle',
    );
  });

  it('should close a school and open it again, and list open and closed schools apart', async () => {
    const created = await addSchool('CLSD', 'Closing Elementary', 'elementary');
    const closed = await coordinator.patch(`/api/schools/${created.body.id}`, {
      version: created.body.version,
      closedOn: '2026-06-12',
    });
    expect(closed.status).toBe(200);
    expect(closed.body.closedOn).toBe('2026-06-12');
    const open = await coordinator.get('/api/schools?status=open&limit=100');
    expect(open.body.rows.map((row: { code: string }) => row.code)).not.toContain('CLSD');
    const closedList = await coordinator.get('/api/schools?status=closed&limit=100');
    expect(closedList.body.rows.map((row: { code: string }) => row.code)).toEqual(['CLSD']);
    const sendToClosed = await addSchool('FEED', 'Feeder School', 'elementary', {
      sendsToSchoolId: created.body.id,
    });
    expect(sendToClosed.status).toBe(400);
    const reopened = await coordinator.patch(`/api/schools/${created.body.id}`, {
      version: closed.body.version,
      closedOn: null,
    });
    expect(reopened.body.closedOn).toBeNull();
    expect(
      (
        await director.patch(`/api/schools/${app.schoolIds['HPMS']}`, {
          version: 1,
          closedOn: '2026-06-12',
        })
      ).status,
    ).toBe(403);
  });
});
