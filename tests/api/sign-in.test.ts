import { describe, expect, it } from 'vitest';
import { CookieJar, walkSignIn } from '../../fakes/oidc/index';
import { demoEmail, useTestApp } from '../support/test-app';

const app = useTestApp();

describe('Sign-in through the identity provider', () => {
  it('should answer 401 on /api/me when nobody is signed in', async () => {
    const response = await app.anonymous.get('/api/me');
    expect(response.status).toBe(401);
    expect(response.body.error.code).toBe('unauthenticated');
  });

  it('should answer the user, role and schools when a director signs in', async () => {
    const director = await app.signIn(demoEmail('director.hpms'));
    const response = await director.get('/api/me');
    expect(response.status).toBe(200);
    expect(response.body).toMatchObject({
      email: 'director.hpms@merrowbasin.example',
      role: 'director',
      allSchools: false,
      schools: [{ code: 'HPMS', name: 'Heron Point Middle' }],
    });
  });

  it('should see every school when the coordinator signs in', async () => {
    const coordinator = await app.signIn(demoEmail('coordinator'));
    const response = await coordinator.get('/api/me');
    expect(response.body.role).toBe('coordinator');
    expect(response.body.allSchools).toBe(true);
    expect(response.body.schools.map((school: { code: string }) => school.code)).toEqual(
      expect.arrayContaining(['HPMS', 'QHMS', 'TRHS', 'FBES']),
    );
  });

  it('should set an httpOnly SameSite cookie of its own name when signing in, and a readable one naming the user', async () => {
    const jar = new CookieJar();
    const { callbackUrl } = await walkSignIn(
      `${app.url}/auth/sign-in`,
      demoEmail('technician'),
      jar,
    );
    const cookies = (await jar.fetch(callbackUrl)).headers.getSetCookie();
    const session = cookies.find((each) => each.startsWith('tuttiboard.sid='));
    expect(session).toMatch(/HttpOnly/i);
    expect(session).toMatch(/SameSite=Lax/i);
    const named = cookies.find((each) => each.startsWith('tuttiboard.user='));
    // Readable by the page (no HttpOnly), as document.cookie exposes only such cookies (RFC 6265 §5.4).
    expect(named).not.toMatch(/HttpOnly/i);
    expect(named).toMatch(/SameSite=Lax/i);
    const me = (await (await jar.fetch(`${app.url}/api/me`)).json()) as { id: number };
    expect(jar.get('tuttiboard.user', app.url)).toBe(String(me.id));
    await jar.fetch(`${app.url}/auth/sign-out`, { method: 'POST', headers: { Origin: app.url } });
    expect(jar.get('tuttiboard.user', app.url)).toBeUndefined();
    expect(jar.get('tuttiboard.sid', app.url)).toBeUndefined();
  });

  it('should not set the readable cookie for a bearer token', async () => {
    const token = await app.token(demoEmail('director.hpms'));
    const response = await app.bearer(token).get('/api/me');
    expect(response.status).toBe(200);
    expect(String(response.headers['set-cookie'] ?? '')).not.toContain('tuttiboard.user');
  });

  it('should issue a new session id at sign-in when a session existed before', async () => {
    const jar = new CookieJar();
    // Starting sign-in creates a session (it holds the PKCE verifier and state).
    const start = await jar.fetch(`${app.url}/auth/sign-in`);
    expect(start.status).toBe(302);
    const before = jar.get('tuttiboard.sid', app.url);
    expect(before).toBeTruthy();
    const { callbackUrl } = await walkSignIn(
      start.headers.get('location')!,
      demoEmail('coordinator'),
      jar,
    );
    await jar.fetch(callbackUrl);
    const after = jar.get('tuttiboard.sid', app.url);
    expect(after).toBeTruthy();
    expect(after).not.toBe(before);
  });

  it('should refuse an account the district does not know even when the provider vouches for it', async () => {
    await app.database.db.execute(
      `update users set active = false where email = 'viewer.trhs@merrowbasin.example'` as never,
    );
    const jar = new CookieJar();
    const { callbackUrl } = await walkSignIn(
      `${app.url}/auth/sign-in`,
      demoEmail('viewer.trhs'),
      jar,
    );
    const landing = await jar.fetch(callbackUrl);
    expect(landing.status).toBe(403);
    expect(await landing.text()).toContain('has no Tuttiboard access');
    await app.database.db.execute(
      `update users set active = true where email = 'viewer.trhs@merrowbasin.example'` as never,
    );
  });

  it('should end the session when the user signs out', async () => {
    const director = await app.signIn(demoEmail('director.qhms'));
    expect((await director.get('/api/me')).status).toBe(200);
    const signOut = await director.post('/auth/sign-out');
    expect(signOut.status).toBe(303);
    expect(signOut.headers['location']).toContain(app.oidc.issuer);
    expect((await director.get('/api/me')).status).toBe(401);
  });

  it('should refuse a cookie-authenticated write that comes from another site', async () => {
    const coordinator = await app.signIn(demoEmail('coordinator'));
    const response = await coordinator
      .post('/api/schools', { code: 'XSRF', name: 'Forged School', level: 'middle' })
      .set('Origin', 'http://evil.example');
    expect(response.status).toBe(403);
    const list = await coordinator.get('/api/schools?code=XSRF');
    expect(list.body.total).toBe(0);
  });
});

describe('API tokens', () => {
  it('should act as the user when a bearer token is sent', async () => {
    const token = await app.token(demoEmail('director.hpms'));
    const response = await app.bearer(token).get('/api/me');
    expect(response.status).toBe(200);
    expect(response.body.email).toBe('director.hpms@merrowbasin.example');
  });

  it('should answer 401 when the token is unknown or malformed', async () => {
    expect((await app.bearer('tutti_not-a-real-token').get('/api/me')).status).toBe(401);
    const malformed = await app.anonymous.get('/api/me').set('Authorization', 'Basic abc');
    expect(malformed.status).toBe(401);
  });

  it('should stop working when the token is revoked, and store only its hash', async () => {
    const director = await app.signIn(demoEmail('director.hpms'));
    const created = await director.post('/api/tokens', { label: 'nightly sync' });
    expect(created.status).toBe(201);
    const token: string = created.body.token;
    expect((await app.bearer(token).get('/api/me')).status).toBe(200);
    const stored = await app.database.db.execute(
      `select token_hash from api_tokens where id = ${Number(created.body.id)}` as never,
    );
    const hash = (stored as unknown as { rows: { token_hash: string }[] }).rows[0]!.token_hash;
    expect(hash).toMatch(/^[0-9a-f]{64}$/);
    expect(hash).not.toContain(token);
    const listed = await director.get('/api/tokens');
    expect(
      listed.body.rows.find((row: { id: number }) => row.id === created.body.id).lastUsedAt,
    ).not.toBeNull();
    expect((await director.delete(`/api/tokens/${created.body.id}`)).status).toBe(204);
    expect((await app.bearer(token).get('/api/me')).status).toBe(401);
  });
});
