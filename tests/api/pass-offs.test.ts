import { randomUUID } from 'node:crypto';
import { beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { passOffBatchResultSchema, passOffSchema } from '@shared/api/pass-off';
import { listResponseSchema } from '@shared/api/list';
import { rowsOf } from '../../server/db/client';
import { byRole, everyRole, useTestApp, type SignedInClient } from '../support/test-app';
import { binary } from '../support/binary-body';

let hpmsStudentId: number;
let qhmsStudentId: number;
let ownStudentId: number;

const today = new Date().toISOString().slice(0, 10);

async function firstStudentOf(code: string, except: number[] = []): Promise<number> {
  const [row] = rowsOf<{ id: number }>(
    await app.database.db
      .execute(sql`select s.id from students s join schools sc on sc.id = s.school_id
      where sc.code = ${code} and s.status = 'active' and not (s.id = any(${`{${except.join(',')}}`}::int[])) order by s.id limit 1`),
  );
  return row!.id;
}

const app = useTestApp({ signIn: everyRole });
const { coordinator, director, otherDirector, viewer, technician, student } = byRole(app.clients);
beforeAll(async () => {
  ownStudentId = (await student.get('/api/me')).body.studentId;
  hpmsStudentId = await firstStudentOf('HPMS', [ownStudentId]);
  qhmsStudentId = await firstStudentOf('QHMS');
});

/** A multipart upload as the signed-in browser would send it. */
const upload = (
  client: SignedInClient,
  path: string,
  bytes: Buffer,
  options: string | { filename: string; contentType?: string },
) => client.upload(path, 'recording', bytes, options);

const entry = (studentId: number, extra: Record<string, unknown> = {}) => ({
  studentId,
  requirementCode: 'r2-bb-major',
  heardOn: today,
  tempo: 76,
  passed: true,
  note: 'Even eighths.',
  ...extra,
});

describe('Pass-offs', () => {
  it('should record a pass-off for a student of the director’s own school, with the hearer and an audit entry', async () => {
    const response = await director.post('/api/pass-offs', entry(hpmsStudentId));
    expect(response.status).toBe(201);
    const passOff = passOffSchema.parse(response.body);
    expect(passOff).toMatchObject({
      studentId: hpmsStudentId,
      requirementCode: 'r2-bb-major',
      tempo: 76,
      passed: true,
      heardByName: 'Marcus Feldqvist',
      standing: 'counts',
    });
    const audit = rowsOf<{ action: string }>(
      await app.database.db.execute(
        sql`select action from audit_log where entity = 'pass-off' and entity_id = ${String(passOff.id)}`,
      ),
    );
    expect(audit.map((row) => row.action)).toEqual(['create']);
  });

  it('should answer 404 when a director records for, or opens, another school’s student', async () => {
    expect((await director.post('/api/pass-offs', entry(qhmsStudentId))).status).toBe(404);
    const theirs = await otherDirector.post('/api/pass-offs', entry(qhmsStudentId));
    expect(theirs.status).toBe(201);
    expect((await director.get(`/api/pass-offs/${theirs.body.id}`)).status).toBe(404);
    expect(
      (
        await director.patch(`/api/pass-offs/${theirs.body.id}`, {
          tempo: 80,
          version: theirs.body.version,
        })
      ).status,
    ).toBe(404);
    expect((await director.delete(`/api/pass-offs/${theirs.body.id}`)).status).toBe(404);
    const list = await director.get(`/api/pass-offs?studentId=${qhmsStudentId}`);
    expect(list.body.total).toBe(0);
  });

  it('should answer 403 when a viewer, a student or the technician tries to record', async () => {
    expect((await viewer.post('/api/pass-offs', entry(hpmsStudentId))).status).toBe(403);
    expect((await student.post('/api/pass-offs', entry(ownStudentId))).status).toBe(403);
    expect((await technician.post('/api/pass-offs', entry(hpmsStudentId))).status).toBe(403);
    expect((await technician.get('/api/pass-offs')).status).toBe(403);
  });

  it('should let a viewer read only their schools’ pass-offs and a student only their own', async () => {
    const viewerList = listResponseSchema(passOffSchema).parse(
      (await viewer.get('/api/pass-offs?limit=1000')).body,
    );
    expect(viewerList.total).toBeGreaterThan(0);
    expect(new Set(viewerList.rows.map((row) => row.schoolId))).toEqual(
      new Set([app.schoolIds['TRHS']]),
    );
    const own = listResponseSchema(passOffSchema).parse(
      (await student.get('/api/pass-offs?limit=1000')).body,
    );
    expect(own.total).toBeGreaterThan(0);
    expect(new Set(own.rows.map((row) => row.studentId))).toEqual(new Set([ownStudentId]));
    const other = await coordinator.get(`/api/pass-offs?studentId=${hpmsStudentId}&limit=1`);
    expect((await student.get(`/api/pass-offs/${other.body.rows[0].id}`)).status).toBe(404);
  });

  it('should filter, sort and page with the list contract', async () => {
    const page = await director.get('/api/pass-offs?sort=tempo:desc&limit=5&offset=2&passed=true');
    expect(page.status).toBe(200);
    expect(page.body.rows).toHaveLength(5);
    const tempos = page.body.rows.map((row: { tempo: number }) => row.tempo);
    expect([...tempos].sort((a, b) => b - a)).toEqual(tempos);
    expect(
      page.body.rows.every(
        (row: { passed: boolean; schoolId: number }) =>
          row.passed && row.schoolId === app.schoolIds['HPMS'],
      ),
    ).toBe(true);
    const october = await coordinator.get(
      '/api/pass-offs?from=2026-10-01&to=2026-10-31&requirementCode=r1-bb-major&limit=1000',
    );
    expect(october.body.total).toBeGreaterThan(0);
    expect(
      october.body.rows.every(
        (row: { heardOn: string; requirementCode: string }) =>
          row.heardOn >= '2026-10-01' &&
          row.heardOn <= '2026-10-31' &&
          row.requirementCode === 'r1-bb-major',
      ),
    ).toBe(true);
    expect((await coordinator.get('/api/pass-offs?sort=secret:asc')).status).toBe(400);
  });

  it('should record a batch once when the same client keys are sent again', async () => {
    const keys = [randomUUID(), randomUUID(), randomUUID()];
    const batch = {
      passOffs: [
        entry(hpmsStudentId, { requirementCode: 'r3-c-major', tempo: 80, clientKey: keys[0] }),
        entry(hpmsStudentId, {
          requirementCode: 'r3-ab-major',
          tempo: 72,
          passed: false,
          clientKey: keys[1],
        }),
        entry(ownStudentId, { requirementCode: 'r3-c-major', tempo: 84, clientKey: keys[2] }),
      ],
    };
    const first = await director.post('/api/pass-offs', batch);
    expect(first.status).toBe(201);
    const result = passOffBatchResultSchema.parse(first.body);
    expect(result).toMatchObject({ created: 3, repeated: 0 });
    const retried = await director.post('/api/pass-offs', batch);
    expect(retried.status).toBe(200);
    expect(retried.body).toMatchObject({ created: 0, repeated: 3 });
    expect(retried.body.rows.map((row: { id: number }) => row.id)).toEqual(
      result.rows.map((row) => row.id),
    );
    const [count] = rowsOf<{ count: number }>(
      await app.database.db.execute(
        sql`select count(*)::int as count from pass_offs where client_key = any(${`{${keys.join(',')}}`}::uuid[])`,
      ),
    );
    expect(count!.count).toBe(3);
    const reused = await director.post(
      '/api/pass-offs',
      entry(ownStudentId, { requirementCode: 'r1-bb-major', clientKey: keys[0] }),
    );
    expect(reused.status).toBe(409);
  });

  it('should refuse a whole batch with field errors when one entry is bad', async () => {
    const before = (await director.get(`/api/pass-offs?studentId=${hpmsStudentId}`)).body.total;
    const response = await director.post('/api/pass-offs', {
      passOffs: [
        entry(hpmsStudentId),
        entry(hpmsStudentId, { requirementCode: 'r9-no-such-scale' }),
        entry(hpmsStudentId, { heardOn: '2099-01-01' }),
      ],
    });
    expect(response.status).toBe(400);
    expect(response.body.error.fieldErrors.map((error: { field: string }) => error.field)).toEqual(
      expect.arrayContaining(['passOffs.1.requirementCode', 'passOffs.2.heardOn']),
    );
    expect((await director.get(`/api/pass-offs?studentId=${hpmsStudentId}`)).body.total).toBe(
      before,
    );
    const tooMany = await director.post('/api/pass-offs', {
      passOffs: Array.from({ length: 201 }, () => entry(hpmsStudentId)),
    });
    expect(tooMany.status).toBe(400);
  });

  it('should keep the summary rung current when a pass-off is written, corrected and deleted', async () => {
    const rungOf = async () =>
      rowsOf<{ rung: number; met_count: number }>(
        await app.database.db.execute(
          sql`select rung, met_count from student_attainment where student_id = ${hpmsStudentId}`,
        ),
      )[0]!;
    const progress = (await director.get(`/api/analytics/students/${hpmsStudentId}/progress`)).body;
    const before = await rungOf();
    expect(before.rung).toBe(progress.rung);
    const requirements = progress.next.requirements as { code: string; tempo: number }[];
    expect(requirements.length).toBeGreaterThan(0);
    const written = await director.post('/api/pass-offs', {
      passOffs: requirements.map((item) =>
        entry(hpmsStudentId, { requirementCode: item.code, tempo: item.tempo - 4 }),
      ),
    });
    expect(written.status).toBe(201);
    expect(
      written.body.rows.every((row: { standing: string }) => row.standing === 'below-tempo'),
    ).toBe(true);
    expect((await rungOf()).rung).toBe(before.rung);
    for (const row of written.body.rows) {
      const corrected = await director.patch(`/api/pass-offs/${row.id}`, {
        tempo: row.tempo + 4,
        version: row.version,
      });
      expect(corrected.status).toBe(200);
      expect(corrected.body.standing).toBe('counts');
    }
    expect((await rungOf()).rung).toBeGreaterThan(before.rung);
    expect(
      (
        await director.patch(`/api/pass-offs/${written.body.rows[0].id}`, {
          tempo: 60,
          version: written.body.rows[0].version,
        })
      ).status,
    ).toBe(409);
    for (const row of written.body.rows)
      expect((await director.delete(`/api/pass-offs/${row.id}`)).status).toBe(204);
    expect(await rungOf()).toEqual(before);
  });
});

describe('Pass-off recordings', () => {
  let passOffId: number;

  beforeAll(async () => {
    passOffId = (
      await director.post(
        '/api/pass-offs',
        entry(ownStudentId, { requirementCode: 'r1-eb-major', tempo: 60 }),
      )
    ).body.id;
  });

  // WAVE header: "RIFF", size, "WAVE", then a fmt chunk (Multimedia Programming Interface 1.0).
  const wave = Buffer.concat([
    Buffer.from('RIFF'),
    Buffer.from([0x24, 0, 0, 0]),
    Buffer.from('WAVEfmt '),
    Buffer.alloc(64),
  ]);

  it('should keep a recording under a random name and stream it back by its content type', async () => {
    const response = await upload(director, `/api/pass-offs/${passOffId}/recording`, wave, {
      filename: '../../etc/passwd.wav',
      contentType: 'audio/webm',
    });
    expect(response.status).toBe(201);
    expect(response.body).toMatchObject({
      contentType: 'audio/wav',
      originalName: 'passwd.wav',
      size: wave.length,
    });
    const [stored] = rowsOf<{ stored_name: string }>(
      await app.database.db.execute(
        sql`select stored_name from pass_off_recordings where id = ${response.body.id}`,
      ),
    );
    expect(stored!.stored_name).toMatch(/^[0-9a-f]{32}$/);
    const heard = await binary(student.get(`/api/pass-offs/${passOffId}/recording`));
    expect(heard.status).toBe(200);
    expect(heard.headers['content-type']).toBe('audio/wav');
    expect(Buffer.compare(heard.body as Buffer, wave)).toBe(0);
    expect((await otherDirector.get(`/api/pass-offs/${passOffId}/recording`)).status).toBe(404);
    expect((await technician.get(`/api/pass-offs/${passOffId}/recording`)).status).toBe(403);
    const progress = await student.get(`/api/analytics/students/${ownStudentId}/progress`);
    expect(progress.body.recordings.map((item: { passOffId: number }) => item.passOffId)).toContain(
      passOffId,
    );
  });

  it('should refuse a text file renamed .webm, and a file over 10 MB', async () => {
    const text = await upload(
      director,
      `/api/pass-offs/${passOffId}/recording`,
      Buffer.from('Just some practice notes, not audio.'),
      { filename: 'scale.webm', contentType: 'audio/webm' },
    );
    expect(text.status).toBe(400);
    expect(text.body.error.fieldErrors[0].field).toBe('recording');
    const large = Buffer.concat([Buffer.from('OggS'), Buffer.alloc(10 * 1024 * 1024 + 1)]);
    const tooLarge = await upload(director, `/api/pass-offs/${passOffId}/recording`, large, {
      filename: 'long.ogg',
    });
    expect(tooLarge.status).toBe(413);
    const kept = await director.get(`/api/pass-offs/${passOffId}`);
    expect(kept.body.recording.contentType).toBe('audio/wav');
  });

  it('should refuse uploads from a viewer and for another school’s pass-off', async () => {
    expect(
      (await upload(viewer, `/api/pass-offs/${passOffId}/recording`, wave, 'take.wav')).status,
    ).toBe(403);
    expect(
      (await upload(otherDirector, `/api/pass-offs/${passOffId}/recording`, wave, 'take.wav'))
        .status,
    ).toBe(404);
  });
});
