import { describe, expect, it } from 'vitest';
import { demoEmail, useTestApp } from '../support/test-app';

interface PersonRow {
  id: number;
  email: string;
  name: string;
  role: string;
  active: boolean;
  version: number;
  schools: { id: number; code: string }[];
  student: { id: number } | null;
  lastSignInAt: string | null;
}

const fieldsOf = (body: { error: { fieldErrors: { field: string }[] } }) =>
  body.error.fieldErrors.map((error) => error.field);

async function personByEmail(email: string): Promise<PersonRow> {
  const found = await coordinator.get(`/api/users?q=${encodeURIComponent(email)}`);
  const row = (found.body.rows as PersonRow[]).find((person) => person.email === email);
  if (!row) throw new Error(`No person ${email} in the list.`);
  return (await coordinator.get(`/api/users/${row.id}`)).body as PersonRow;
}

const app = useTestApp({ signIn: ['coordinator', 'director.hpms', 'technician'] });
const { coordinator, 'director.hpms': director, technician } = app.clients;

describe('People', () => {
  it('should answer 403 to everyone but the coordinator', async () => {
    const someone = await personByEmail(demoEmail('director.qhms'));
    for (const client of [director, technician]) {
      expect((await client.get('/api/users')).status).toBe(403);
      expect((await client.get(`/api/users/${someone.id}`)).status).toBe(403);
      expect((await client.get('/api/audit')).status).toBe(403);
      const created = await client.post('/api/users', {
        email: 'sneaky@merrowbasin.example',
        name: 'Sneaky Person',
        role: 'coordinator',
      });
      expect(created.status).toBe(403);
      const promoted = await client.patch(`/api/users/${someone.id}`, {
        role: 'coordinator',
        schoolIds: [],
        version: someone.version,
      });
      expect(promoted.status).toBe(403);
    }
    const viewerToken = await app.token(demoEmail('viewer.trhs'));
    expect((await app.bearer(viewerToken).get('/api/users')).status).toBe(403);
    expect((await coordinator.get('/api/users?q=sneaky')).body.total).toBe(0);
    expect((await personByEmail(demoEmail('director.qhms'))).role).toBe('director');
  });

  it('should list people with their schools, searched, filtered and sorted', async () => {
    const list = await coordinator.get('/api/users?limit=100');
    expect(list.status).toBe(200);
    const fbes = (list.body.rows as PersonRow[]).find(
      (row) => row.email === demoEmail('director.fbes'),
    )!;
    expect(fbes.schools.map((school) => school.code).sort()).toEqual(['CWES', 'FBES']);
    const signedIn = (list.body.rows as PersonRow[]).find(
      (row) => row.email === demoEmail('coordinator'),
    )!;
    expect(signedIn.lastSignInAt).not.toBeNull();

    const directors = await coordinator.get('/api/users?role=director&sort=email:asc');
    const emails = (directors.body.rows as PersonRow[]).map((row) => row.email);
    expect(emails.length).toBeGreaterThanOrEqual(5);
    expect(emails).toEqual([...emails].sort());
    expect((directors.body.rows as PersonRow[]).every((row) => row.role === 'director')).toBe(true);

    const atTrhs = await coordinator.get(
      `/api/users?schoolId=${app.schoolIds['TRHS']}&sort=email:asc`,
    );
    expect((atTrhs.body.rows as PersonRow[]).map((row) => row.email)).toEqual([
      demoEmail('director.trhs'),
      demoEmail('viewer.trhs'),
    ]);
    const searched = await coordinator.get('/api/users?q=TALLOWBROOK');
    expect((searched.body.rows as PersonRow[]).map((row) => row.email)).toEqual([
      demoEmail('director.qhms'),
    ]);

    const recent = await coordinator.get('/api/users?sort=lastSignInAt:desc&limit=3');
    expect(recent.body.rows.map((row: PersonRow) => row.email)).toEqual(
      expect.arrayContaining([
        demoEmail('coordinator'),
        demoEmail('technician'),
        demoEmail('director.hpms'),
      ]),
    );
    const bad = await coordinator.get('/api/users?sort=password:asc');
    expect(bad.status).toBe(400);
    expect(fieldsOf(bad.body)).toEqual(['sort']);
  });

  it('should add a director for a school, whose API token then sees only that school', async () => {
    const created = await coordinator.post('/api/users', {
      email: '  Wilhelmina.Ashgrove@MerrowBasin.example ',
      name: 'Wilhelmina Ashgrove',
      role: 'director',
      schoolIds: [app.schoolIds['QHMS']],
    });
    expect(created.status).toBe(201);
    expect(created.body.email).toBe('wilhelmina.ashgrove@merrowbasin.example');
    expect(created.body.schools.map((school: { code: string }) => school.code)).toEqual(['QHMS']);
    expect(created.body.tokens).toEqual({ live: 0, revoked: 0, lastUsedAt: null });
    expect(
      (await coordinator.get('/api/users?active=true&role=director')).body.rows.map(
        (row: PersonRow) => row.email,
      ),
    ).toContain('wilhelmina.ashgrove@merrowbasin.example');
    const token = await app.token('wilhelmina.ashgrove@merrowbasin.example');
    const me = await app.bearer(token).get('/api/me');
    expect(me.status).toBe(200);
    expect(me.body.schools.map((school: { code: string }) => school.code)).toEqual(['QHMS']);
  });

  it('should answer 400 with field errors and add nobody when the input is bad', async () => {
    const response = await coordinator.post('/api/users', {
      email: 'not-an-address',
      name: '',
      role: 'principal',
    });
    expect(response.status).toBe(400);
    expect(fieldsOf(response.body)).toEqual(expect.arrayContaining(['email', 'name', 'role']));

    // Each body is refused on the one field named beside it.
    const refused: [object, string[]][] = [
      [{ email: 'noschool@merrowbasin.example', name: 'No School', role: 'viewer' }, ['schoolIds']],
      [
        {
          email: 'tech2@merrowbasin.example',
          name: 'Second Technician',
          role: 'technician',
          schoolIds: [app.schoolIds['HPMS']],
        },
        ['schoolIds'],
      ],
      [
        {
          email: 'ghost@merrowbasin.example',
          name: 'Ghost School',
          role: 'director',
          schoolIds: [999999],
        },
        ['schoolIds'],
      ],
      [{ email: demoEmail('technician'), name: 'Copy Cat', role: 'technician' }, ['email']],
    ];
    for (const [body, fields] of refused) {
      const answer = await coordinator.post('/api/users', body);
      expect(answer.status, JSON.stringify(body)).toBe(400);
      expect(fieldsOf(answer.body)).toEqual(fields);
    }
    const found = await coordinator.get('/api/users?q=merrowbasin.example&limit=200');
    const emails = found.body.rows.map((row: PersonRow) => row.email);
    for (const email of ['noschool', 'tech2', 'ghost'])
      expect(emails).not.toContain(`${email}@merrowbasin.example`);
  });

  it('should link a student account to an existing roster row only', async () => {
    const noStudent = await coordinator.post('/api/users', {
      email: 'pupil@merrowbasin.example',
      name: 'Pupil Without Row',
      role: 'student',
    });
    expect(fieldsOf(noStudent.body)).toEqual(['studentId']);
    const unknown = await coordinator.post('/api/users', {
      email: 'pupil@merrowbasin.example',
      name: 'Pupil Unknown',
      role: 'student',
      studentId: 99999999,
    });
    expect(unknown.status).toBe(400);
    expect(fieldsOf(unknown.body)).toEqual(['studentId']);
    const linkedAlready = (await personByEmail(demoEmail('student.hpms'))).student!.id;
    const twice = await coordinator.post('/api/users', {
      email: 'pupil@merrowbasin.example',
      name: 'Pupil Twice',
      role: 'student',
      studentId: linkedAlready,
    });
    expect(twice.status).toBe(400);
    expect(twice.body.error.message).toContain(demoEmail('student.hpms'));

    const roster = await coordinator.get(`/api/students?schoolId=${app.schoolIds['QHMS']}&limit=5`);
    const student = roster.body.rows.find((row: { id: number }) => row.id !== linkedAlready);
    const created = await coordinator.post('/api/users', {
      email: 'pupil@merrowbasin.example',
      name: 'Pupil Linked',
      role: 'student',
      studentId: student.id,
    });
    expect(created.status).toBe(201);
    expect(created.body.student.id).toBe(student.id);
    expect(created.body.schools.map((school: { code: string }) => school.code)).toEqual(['QHMS']);
  });

  it('should answer 409 when an edit starts from a stale version, and replace the schools', async () => {
    const person = await personByEmail(demoEmail('director.omms'));
    const first = await coordinator.patch(`/api/users/${person.id}`, {
      schoolIds: [app.schoolIds['OMMS'], app.schoolIds['HPMS']],
      version: person.version,
    });
    expect(first.status).toBe(200);
    expect(first.body.version).toBe(person.version + 1);
    expect(first.body.schools.map((school: { code: string }) => school.code).sort()).toEqual([
      'HPMS',
      'OMMS',
    ]);
    const stale = await coordinator.patch(`/api/users/${person.id}`, {
      name: 'Overwritten Name',
      version: person.version,
    });
    expect(stale.status).toBe(409);
    const after = await personByEmail(demoEmail('director.omms'));
    expect(after.name).toBe(person.name);
    expect(after.schools.map((school) => school.code).sort()).toEqual(['HPMS', 'OMMS']);
    const replaced = await coordinator.patch(`/api/users/${person.id}`, {
      schoolIds: [app.schoolIds['OMMS']],
      version: after.version,
    });
    expect(replaced.body.schools.map((school: { code: string }) => school.code)).toEqual(['OMMS']);
    const emptied = await coordinator.patch(`/api/users/${person.id}`, {
      schoolIds: [],
      version: replaced.body.version,
    });
    expect(emptied.status).toBe(400);
    expect(fieldsOf(emptied.body)).toEqual(['schoolIds']);
  });

  it('should refuse to let a coordinator deactivate or demote themselves', async () => {
    const self = await personByEmail(demoEmail('coordinator'));
    const deactivate = await coordinator.patch(`/api/users/${self.id}`, {
      active: false,
      version: self.version,
    });
    expect(deactivate.status).toBe(400);
    expect(fieldsOf(deactivate.body)).toEqual(['active']);
    expect(deactivate.body.error.message).toMatch(/cannot deactivate your own account/);
    const demote = await coordinator.patch(`/api/users/${self.id}`, {
      role: 'director',
      schoolIds: [app.schoolIds['HPMS']],
      version: self.version,
    });
    expect(demote.status).toBe(400);
    expect(fieldsOf(demote.body)).toEqual(['role']);
    const after = await personByEmail(demoEmail('coordinator'));
    expect(after).toMatchObject({ role: 'coordinator', active: true, version: self.version });
    expect((await coordinator.get('/api/users')).status).toBe(200);
  });

  it('should let a coordinator hand the role on: a second coordinator may then demote the first', async () => {
    const promoted = await personByEmail(demoEmail('director.trhs'));
    const made = await coordinator.patch(`/api/users/${promoted.id}`, {
      role: 'coordinator',
      version: promoted.version,
    });
    expect(made.status).toBe(200);
    expect(made.body.schools).toEqual([]);
    const second = await app.signIn(demoEmail('director.trhs'));
    const first = await personByEmail(demoEmail('coordinator'));
    const demoted = await second.patch(`/api/users/${first.id}`, {
      role: 'viewer',
      schoolIds: [app.schoolIds['TRHS']],
      version: first.version,
    });
    expect(demoted.status).toBe(200);
    expect((await coordinator.get('/api/users')).status).toBe(403);
    // The last coordinator now is the second one, who cannot step down either.
    const self = (await second.get(`/api/users/${promoted.id}`)).body as PersonRow;
    expect(
      (await second.patch(`/api/users/${promoted.id}`, { active: false, version: self.version }))
        .status,
    ).toBe(400);
    const restored = await second.patch(`/api/users/${first.id}`, {
      role: 'coordinator',
      schoolIds: [],
      version: demoted.body.version,
    });
    expect(restored.status).toBe(200);
  });

  it('should deactivate a person: their token stops working, and reactivation restores it', async () => {
    const person = await personByEmail(demoEmail('director.fbes'));
    const token = await app.token(demoEmail('director.fbes'));
    expect((await app.bearer(token).get('/api/me')).status).toBe(200);
    const off = await coordinator.patch(`/api/users/${person.id}`, {
      active: false,
      version: person.version,
    });
    expect(off.status).toBe(200);
    expect(off.body.active).toBe(false);
    expect((await app.bearer(token).get('/api/me')).status).toBe(401);
    expect(
      (await coordinator.get('/api/users?active=false')).body.rows.map(
        (row: PersonRow) => row.email,
      ),
    ).toContain(demoEmail('director.fbes'));
    const on = await coordinator.patch(`/api/users/${person.id}`, {
      active: true,
      version: off.body.version,
    });
    expect(on.body.active).toBe(true);
    expect((await app.bearer(token).get('/api/me')).status).toBe(200);
    expect(
      (await coordinator.get(`/api/users/${person.id}`)).body.tokens.live,
    ).toBeGreaterThanOrEqual(1);
  });

  it('should record every change with before and after, readable newest first in /api/audit', async () => {
    const person = await personByEmail(demoEmail('viewer.trhs'));
    const changed = await coordinator.patch(`/api/users/${person.id}`, {
      name: 'Priya Castellane-Moor',
      schoolIds: [app.schoolIds['TRHS'], app.schoolIds['QHMS']],
      version: person.version,
    });
    expect(changed.status).toBe(200);
    const audit = await coordinator.get(`/api/audit?entity=user&entityId=${person.id}`);
    expect(audit.status).toBe(200);
    expect(audit.body.total).toBe(1);
    const [entry] = audit.body.rows;
    expect(entry).toMatchObject({
      action: 'update',
      entity: 'user',
      entityId: String(person.id),
      userEmail: demoEmail('coordinator'),
      entityName: 'Priya Castellane-Moor',
      before: { name: 'Priya Castellane', schools: ['TRHS'] },
      after: { name: 'Priya Castellane-Moor' },
    });
    expect([...entry.after.schools].sort()).toEqual(['QHMS', 'TRHS']);

    const self = await personByEmail(demoEmail('coordinator'));
    const mine = await coordinator.get(`/api/audit?userId=${self.id}&limit=500`);
    expect(mine.body.total).toBe(mine.body.rows.length);
    const times = mine.body.rows.map((row: { at: string }) => Date.parse(row.at));
    expect(times).toEqual([...times].sort((a, b) => b - a));
    expect(mine.body.rows.every((row: { userId: number }) => row.userId === self.id)).toBe(true);
    const created = mine.body.rows.find(
      (row: { action: string; after: { email?: string } }) =>
        row.action === 'create' && row.after?.email === 'wilhelmina.ashgrove@merrowbasin.example',
    );
    expect(created).toMatchObject({
      entity: 'user',
      before: null,
      after: { role: 'director', schools: ['QHMS'] },
    });
    const signIns = await coordinator.get(`/api/audit?entity=user&entityId=${self.id}&q=sign-in`);
    expect(signIns.body.total).toBeGreaterThanOrEqual(1);
    expect(signIns.body.rows[0]).toMatchObject({
      action: 'sign-in',
      userId: null,
      entityName: self.name,
    });
    const oldestFirst = await coordinator.get(`/api/audit?userId=${self.id}&sort=at:asc&limit=1`);
    expect(Date.parse(oldestFirst.body.rows[0].at)).toBe(Math.min(...times));
  });
});
