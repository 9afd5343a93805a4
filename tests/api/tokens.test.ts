import { eq, sql } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { apiTokens } from '../../server/db/schema/index';
import { useTestApp } from '../support/test-app';

const app = useTestApp({ signIn: ['coordinator', 'director.hpms'] });
const { coordinator, 'director.hpms': director } = app.clients;

const day = 24 * 60 * 60 * 1000;

describe('API token lifetimes', () => {
  it('should last 90 days unless told, and show when it expires in the list', async () => {
    const made = await director.post('/api/tokens', { label: 'Nightly export' });
    expect(made.status).toBe(201);
    const expiresIn = Date.parse(made.body.expiresAt) - Date.now();
    expect(Math.round(expiresIn / day)).toBe(90);
    const list = await director.get('/api/tokens');
    const listed = list.body.rows.find((row: { id: number }) => row.id === made.body.id);
    expect(listed).toMatchObject({ label: 'Nightly export', expiresAt: made.body.expiresAt });
  });

  it('should take a lifetime of a day to a year and refuse longer', async () => {
    const short = await director.post('/api/tokens', { label: 'One-off', lifetimeDays: 1 });
    expect(short.status).toBe(201);
    expect(Math.round((Date.parse(short.body.expiresAt) - Date.now()) / day)).toBe(1);
    const year = await director.post('/api/tokens', { label: 'Yearly', lifetimeDays: 365 });
    expect(year.status).toBe(201);
    const tooLong = await director.post('/api/tokens', { label: 'Forever', lifetimeDays: 366 });
    expect(tooLong.status).toBe(400);
    expect(tooLong.body.error.fieldErrors[0].field).toBe('lifetimeDays');
  });

  it('should refuse a token once it has expired', async () => {
    const made = await director.post('/api/tokens', { label: 'Expiring', lifetimeDays: 1 });
    const token = made.body.token as string;
    expect((await app.bearer(token).get('/api/me')).status).toBe(200);
    await app.database.db
      .update(apiTokens)
      .set({ expiresAt: sql`now() - interval '1 second'` })
      .where(eq(apiTokens.id, made.body.id));
    const refused = await app.bearer(token).get('/api/me');
    expect(refused.status).toBe(401);
    expect(refused.body.error.message).toMatch(/expired/);
  });

  it('should refuse a field the token does not take, naming it, and make no token', async () => {
    const before = (await director.get('/api/tokens')).body.total;
    const refused = await director.post('/api/tokens', { name: 'x' });
    expect(refused.status).toBe(400);
    expect(refused.body.error.fieldErrors).toEqual([
      { field: 'name', message: "'name' is not a field this request takes." },
    ]);
    expect(refused.body.error.message).toContain('name');
    expect((await director.get('/api/tokens')).body.total).toBe(before);
  });
});

describe('Each person’s tokens for the coordinator', () => {
  it('should list one person’s tokens when asked by userId, and let the coordinator revoke them', async () => {
    const me = await director.get('/api/me');
    const made = await director.post('/api/tokens', { label: 'For revoking' });
    const theirs = await coordinator.get(`/api/tokens?userId=${me.body.id}`);
    expect(theirs.status).toBe(200);
    expect(theirs.body.rows.length).toBeGreaterThan(0);
    expect(theirs.body.rows.every((row: { userId: number }) => row.userId === me.body.id)).toBe(
      true,
    );
    expect(theirs.body.total).toBe(theirs.body.rows.length);
    expect((await coordinator.delete(`/api/tokens/${made.body.id}`)).status).toBe(204);
    expect((await app.bearer(made.body.token).get('/api/me')).status).toBe(401);
  });

  it('should not let a director see another person’s tokens through the filter', async () => {
    const coordinatorMe = await coordinator.get('/api/me');
    await coordinator.post('/api/tokens', { label: 'Coordinator script' });
    const answer = await director.get(`/api/tokens?userId=${coordinatorMe.body.id}`);
    expect(answer.status).toBe(200);
    expect(answer.body.rows).toEqual([]);
  });
});

describe('Filters that exist', () => {
  it('should filter enrollments by school rather than ignore the parameter', async () => {
    const schools = (await coordinator.get('/api/schools?limit=100')).body.rows as { id: number }[];
    const school = schools[1]!;
    const all = await coordinator.get('/api/enrollments?limit=1');
    const one = await coordinator.get(`/api/enrollments?schoolId=${school.id}&limit=1000`);
    expect(one.status).toBe(200);
    expect(one.body.total).toBeGreaterThan(0);
    expect(one.body.total).toBeLessThan(all.body.total);
    const ensembles = (await coordinator.get(`/api/ensembles?schoolId=${school.id}&limit=1000`))
      .body.rows as { id: number }[];
    const ensembleIds = new Set(ensembles.map((ensemble) => ensemble.id));
    expect(
      one.body.rows.every((row: { ensembleId: number }) => ensembleIds.has(row.ensembleId)),
    ).toBe(true);
  });

  it('should refuse an unknown filter by name', async () => {
    const answer = await coordinator.get('/api/students?schoolid=2');
    expect(answer.status).toBe(400);
    expect(answer.body.error.fieldErrors).toEqual([
      { field: 'schoolid', message: "'schoolid' is not a field this request takes." },
    ]);
  });

  it('should answer 400 for ids of 2^31 and more, a year-0 date and a NUL character', async () => {
    // PostgreSQL 18 documentation §8.1.1: integer is at most 2147483647.
    expect((await coordinator.get('/api/students?schoolId=2147483648')).status).toBe(400);
    expect((await coordinator.get('/api/pass-offs?studentId=2147483648')).status).toBe(400);
    const entry = {
      studentId: 2147483648,
      requirementCode: 'r2-bb-major',
      heardOn: '2026-10-01',
      tempo: 80,
      passed: true,
    };
    const tooLarge = await director.post('/api/pass-offs', entry);
    expect(tooLarge.status).toBe(400);
    expect(tooLarge.body.error.fieldErrors.map((error: { field: string }) => error.field)).toEqual([
      'studentId',
    ]);
    const yearZero = await director.post('/api/pass-offs', {
      ...entry,
      studentId: 1,
      heardOn: '0000-01-01',
    });
    expect(yearZero.status).toBe(400);
    expect(yearZero.body.error.fieldErrors.map((error: { field: string }) => error.field)).toEqual([
      'heardOn',
    ]);
    // PostgreSQL 18 documentation §8.3: the character with code zero cannot be stored in text.
    const nul = await director.post('/api/pass-offs', { ...entry, studentId: 1, note: 'a\u0000b' });
    expect(nul.status).toBe(400);
    expect(nul.body.error.fieldErrors).toContainEqual({
      field: 'note',
      message: 'Remove the control characters from this text.',
    });
  });
});
