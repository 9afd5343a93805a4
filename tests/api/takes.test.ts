import fs from 'node:fs';
import { describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import request from 'supertest';
import { analyseTake } from '@shared/listening';
import { pattern } from '@shared/music';
import { takeSchema } from '@shared/api/take';
import { rowsOf } from '../../server/db/client';
import { recordingPath } from '../../server/pass-offs/recordings-store';
import { removeExpiredTakes } from '../../server/takes/takes-service';
import { synthTake, wavBytes } from '../support/synth-take';
import { byRole, demoEmail, everyRole, useTestApp, type SignedInClient } from '../support/test-app';
import { binary } from '../support/binary-body';

// A short take of concert Eb major long tones for a flute, with its analysis.
const notes = pattern('arpeggio-long', { tonic: 'Eb', mode: 'major' }, { instrument: 'flute' });
const synthesised = synthTake(notes, 160, { sampleRate: 16_000, leadIn: 0.2 });
const wave = Buffer.from(wavBytes(synthesised.samples, synthesised.sampleRate));
const analysis = analyseTake(synthesised.samples, synthesised.sampleRate, notes, 160);

const app = useTestApp({ signIn: everyRole });
const { coordinator, director, otherDirector, viewer, technician, student } = byRole(app.clients);

const keep = (
  client: SignedInClient,
  fields: Record<string, string>,
  bytes: Buffer = wave,
  filename = 'take.wav',
) => {
  return client.upload('/api/takes', 'recording', bytes, filename, fields);
};
const goodFields = () => ({
  requirementCode: 'r1-eb-major',
  tempoAsked: '160',
  analysis: JSON.stringify(analysis),
});
const put = (client: SignedInClient, path: string, body: object) =>
  request(app.url).put(path).set({ Cookie: client.cookie, Origin: app.url }).send(body);
const takeCount = async () =>
  rowsOf<{ n: number }>(
    await app.database.db.execute(sql`select count(*)::int as n from takes`),
  )[0]!.n;

describe('Takes', () => {
  let takeId: number;

  it('should keep a student’s take with its analysis, heard by the student alone until sent', async () => {
    expect(analysis.pitchAccuracy).toBe(1);
    const response = await keep(student, goodFields());
    expect(response.status).toBe(201);
    const take = takeSchema.parse(response.body);
    expect(take).toMatchObject({
      requirementCode: 'r1-eb-major',
      tempoAsked: 160,
      contentType: 'audio/wav',
      status: 'kept',
      sentAt: null,
    });
    expect(take.analysis).toEqual(analysis);
    takeId = take.id;
    expect((await student.get('/api/takes')).body.map((t: { id: number }) => t.id)).toContain(
      takeId,
    );
    expect((await director.get('/api/takes')).body).toEqual([]);
    expect((await director.get(`/api/takes/${takeId}/recording`)).status).toBe(404);
    expect((await coordinator.get(`/api/takes/${takeId}/recording`)).status).toBe(404);
  });

  it('should let the student send it, and then their directors and the coordinator hear it', async () => {
    const sent = await student.post(`/api/takes/${takeId}/send`);
    expect(sent.status).toBe(200);
    expect(sent.body.status).toBe('sent');
    expect(sent.body.sentAt).not.toBeNull();
    const listed = (await director.get('/api/takes')).body as { id: number; studentName: string }[];
    expect(listed.map((t) => t.id)).toEqual([takeId]);
    const heard = await binary(director.get(`/api/takes/${takeId}/recording`));
    expect(heard.status).toBe(200);
    expect(heard.headers['content-type']).toBe('audio/wav');
    expect(Buffer.compare(heard.body as Buffer, wave)).toBe(0);
    expect((await coordinator.get('/api/takes')).body.map((t: { id: number }) => t.id)).toContain(
      takeId,
    );
  });

  it('should keep other schools’ directors, viewers and the technician from hearing it', async () => {
    expect((await otherDirector.get('/api/takes')).body).toEqual([]);
    expect((await otherDirector.get(`/api/takes/${takeId}/recording`)).status).toBe(404);
    expect((await viewer.get('/api/takes')).status).toBe(403);
    expect((await viewer.get(`/api/takes/${takeId}/recording`)).status).toBe(403);
    expect((await technician.get('/api/takes')).status).toBe(403);
  });

  it('should refuse a take from anyone but a student, and a send by anyone else', async () => {
    expect((await keep(director, goodFields())).status).toBe(403);
    expect((await director.post(`/api/takes/${takeId}/send`)).status).toBe(403);
  });

  it('should answer 400 and store nothing for a file that is not audio, a bad analysis or an unknown requirement', async () => {
    const before = await takeCount();
    const files = fs.readdirSync(`${app.config.dataDir}/recordings`).length;
    const notAudio = await keep(student, goodFields(), Buffer.from('%PDF-1.7 not a take'), 'a.pdf');
    expect(notAudio.status).toBe(400);
    expect(notAudio.body.error.message).toMatch(/not a recording/);
    const badAnalysis = await keep(student, { ...goodFields(), analysis: '{"tempo": "fast"}' });
    expect(badAnalysis.status).toBe(400);
    const notJson = await keep(student, { ...goodFields(), analysis: 'heard it all' });
    expect(notJson.status).toBe(400);
    const unknown = await keep(student, { ...goodFields(), requirementCode: 'r9-no-such-thing' });
    expect(unknown.status).toBe(400);
    expect(unknown.body.error.message).toMatch(/not on the ladder/);
    expect(await takeCount()).toBe(before);
    expect(fs.readdirSync(`${app.config.dataDir}/recordings`).length).toBe(files);
  });
});

describe('A director’s take kept as evidence', () => {
  const heard = (client: SignedInClient, fields: Record<string, string>, bytes: Buffer = wave) =>
    client.upload('/api/takes/heard', 'recording', bytes, 'heard.wav', fields);
  const studentOf = async (email: string) =>
    rowsOf<{ student_id: number }>(
      await app.database.db.execute(sql`select student_id from users where email = ${email}`),
    )[0]!.student_id;

  it('should keep the take a director records of their student, heard by the student, the school’s directors and the coordinator', async () => {
    const studentId = await studentOf(demoEmail('student.hpms'));
    const response = await heard(director, { ...goodFields(), studentId: String(studentId) });
    expect(response.status).toBe(201);
    const take = takeSchema.parse(response.body);
    expect(take).toMatchObject({ studentId, heardLive: true, status: 'sent' });
    expect(take.analysis).toEqual(analysis);
    const [row] = rowsOf<{ recorded_by: number | null }>(
      await app.database.db.execute(sql`select recorded_by from takes where id = ${take.id}`),
    );
    expect(row!.recorded_by).not.toBeNull();
    for (const client of [student, director, coordinator]) {
      expect((await client.get(`/api/takes/${take.id}/recording`)).status).toBe(200);
    }
    expect((await otherDirector.get(`/api/takes/${take.id}/recording`)).status).toBe(404);
    expect((await viewer.get(`/api/takes/${take.id}/recording`)).status).toBe(403);
  });

  it('should answer 404 for a student of another school, 403 for roles that hear no one, and 400 for bad fields, storing nothing', async () => {
    const studentId = await studentOf(demoEmail('student.hpms'));
    const before = await takeCount();
    const fields = { ...goodFields(), studentId: String(studentId) };
    expect((await heard(otherDirector, fields)).status).toBe(404);
    expect((await heard(viewer, fields)).status).toBe(403);
    expect((await heard(technician, fields)).status).toBe(403);
    expect((await heard(student, fields)).status).toBe(403);
    expect((await heard(director, { ...fields, studentId: 'x' })).status).toBe(400);
    expect((await heard(director, fields, Buffer.from('not audio at all'))).status).toBe(400);
    expect(await takeCount()).toBe(before);
  });

  it('should remove a director’s take under the same retention as a student’s', async () => {
    const studentId = await studentOf(demoEmail('student.hpms'));
    const take = takeSchema.parse(
      (await heard(coordinator, { ...goodFields(), studentId: String(studentId) })).body,
    );
    const farAhead = new Date(Date.now() + 20 * 365 * 86_400_000);
    await removeExpiredTakes(app.database.db, app.config.dataDir, farAhead);
    const left = rowsOf<{ id: number }>(
      await app.database.db.execute(sql`select id from takes where id = ${take.id}`),
    );
    expect(left).toEqual([]);
  });
});

describe('Take retention', () => {
  it('should keep takes until the end of the school year unless the coordinator says otherwise', async () => {
    expect((await coordinator.get('/api/settings/take-retention')).body).toEqual({
      keep: 'school-year',
    });
    expect((await director.get('/api/settings/take-retention')).status).toBe(403);
    expect(
      (await put(director, '/api/settings/take-retention', { keep: 'days', days: 30 })).status,
    ).toBe(403);
    const bad = await put(coordinator, '/api/settings/take-retention', { keep: 'days', days: 0 });
    expect(bad.status).toBe(400);
    expect((await coordinator.get('/api/settings/take-retention')).body.keep).toBe('school-year');
  });

  it('should remove a take made in a school year once that year has ended, with its file', async () => {
    const take = takeSchema.parse((await keep(student, goodFields())).body);
    const [year] = rowsOf<{ ends_on: string }>(
      await app.database.db.execute(
        sql`select ends_on::text from school_years where current order by starts_on desc limit 1`,
      ),
    );
    const [stored] = rowsOf<{ stored_name: string }>(
      await app.database.db.execute(sql`select stored_name from takes where id = ${take.id}`),
    );
    const file = recordingPath(app.config.dataDir, stored!.stored_name);
    const ids = async () =>
      rowsOf<{ id: number }>(await app.database.db.execute(sql`select id from takes`)).map(
        (row) => row.id,
      );
    await removeExpiredTakes(app.database.db, app.config.dataDir, new Date());
    expect(await ids()).toContain(take.id);
    const dayAfterYear = new Date(`${year!.ends_on}T12:00:00Z`);
    dayAfterYear.setUTCDate(dayAfterYear.getUTCDate() + 1);
    await removeExpiredTakes(app.database.db, app.config.dataDir, dayAfterYear);
    expect(await ids()).not.toContain(take.id);
    expect(fs.existsSync(file)).toBe(false);
  });

  it('should remove takes older than the days the coordinator set', async () => {
    const saved = await put(coordinator, '/api/settings/take-retention', {
      keep: 'days',
      days: 30,
    });
    expect(saved.status).toBe(200);
    const take = takeSchema.parse((await keep(student, goodFields())).body);
    const in29Days = new Date(Date.now() + 29 * 86_400_000);
    expect(await removeExpiredTakes(app.database.db, app.config.dataDir, in29Days)).toBe(0);
    const in31Days = new Date(Date.now() + 31 * 86_400_000);
    expect(await removeExpiredTakes(app.database.db, app.config.dataDir, in31Days)).toBeGreaterThan(
      0,
    );
    const left = rowsOf<{ id: number }>(
      await app.database.db.execute(sql`select id from takes where id = ${take.id}`),
    );
    expect(left).toEqual([]);
  });
});
