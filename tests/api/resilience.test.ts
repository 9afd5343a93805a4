import { describe, expect, it } from 'vitest';
import { demoEmail, useTestApp } from '../support/test-app';

const app = useTestApp();

describe('When the identity provider is down', () => {
  it('should show a clear sign-in error page while tokens keep working', async () => {
    const token = await app.token(demoEmail('coordinator'));
    await app.oidc.close();
    const page = await app.anonymous.get('/auth/sign-in');
    expect(page.status).toBe(503);
    expect(page.text).toContain('Sign-in is not available right now');
    expect(page.text).not.toMatch(/<script/i);
    const me = await app.bearer(token).get('/api/me');
    expect(me.status).toBe(200);
  });
});

describe('Rate limits', () => {
  it('should answer 429 when an address keeps sending bad tokens', async () => {
    const statuses: number[] = [];
    for (let attempt = 0; attempt < 35; attempt += 1) {
      statuses.push((await app.bearer(`tutti_guess-${attempt}`).get('/api/me')).status);
    }
    expect(statuses.slice(0, 30).every((status) => status === 401)).toBe(true);
    expect(statuses.at(-1)).toBe(429);
  });

  it('should still take a valid token from an address that sent too many bad ones', async () => {
    // The address (127.0.0.1) is over its failed-token limit from the test above.
    expect((await app.bearer('tutti_guess-again').get('/api/me')).status).toBe(429);
    const token = await app.token(demoEmail('director.hpms'));
    const statuses: number[] = [];
    for (let attempt = 0; attempt < 5; attempt += 1) {
      statuses.push((await app.bearer(token).get('/api/me')).status);
    }
    expect(statuses).toEqual([200, 200, 200, 200, 200]);
    // A good token's answers are not failures: the next bad one is still refused, not counted anew.
    expect((await app.bearer('tutti_guess-last').get('/api/me')).status).toBe(429);
  });
});
