import { createHash } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createLogger } from '../../server/logger';
import { startTestApp, type TestApp } from '../support/test-app';

/** The directives of a Content-Security-Policy header, by name. */
function directives(header: string | undefined): Map<string, string[]> {
  return new Map(
    (header ?? '')
      .split(';')
      .map((part) => part.trim().split(/\s+/))
      .filter((words) => words[0])
      .map(([name, ...sources]) => [name!, sources]),
  );
}

describe('Security headers', () => {
  let app: TestApp;
  beforeAll(async () => {
    app = await startTestApp({ template: 'empty' });
  });
  afterAll(async () => {
    await app?.close();
  });

  // W3C Content Security Policy Level 3: without 'unsafe-inline' or 'unsafe-eval' in
  // script-src, no inline script or eval runs but those named by their hash ("hash-source":
  // 'sha256-' and the base64 SHA-256 of the script's text); OWASP ASVS 4.0.3 V14.4.3 asks for
  // such a policy.
  it('should send a Content-Security-Policy with no inline-script exception on every answer', async () => {
    // The index page's own inline scripts, when the web build is there to serve it.
    const index = await app.anonymous.get('/index.html');
    const inline =
      index.status === 200
        ? [...index.text.matchAll(/<script>(.*?)<\/script>/gs)].map(
            (match) => `'sha256-${createHash('sha256').update(match[1]!).digest('base64')}'`,
          )
        : [];
    // The app's pages are the same middleware's answers; the browser suite checks them loaded.
    for (const target of ['/api/me', '/auth/sign-in', '/api/no-such-route', '/index.html']) {
      const response = await app.anonymous.get(target);
      const policy = directives(response.headers['content-security-policy']);
      const [self, ...hashes] = policy.get('script-src') ?? [];
      expect(self, target).toBe("'self'");
      for (const hash of hashes) expect(hash, target).toMatch(/^'sha256-[A-Za-z0-9+/]{43}='$/);
      expect(hashes, target).toEqual(expect.arrayContaining(inline));
      expect(policy.get('default-src'), target).toEqual(["'self'"]);
      expect(policy.get('object-src'), target).toEqual(["'none'"]);
      expect(policy.get('frame-ancestors'), target).toEqual(["'none'"]);
    }
  });

  // OWASP ASVS 4.0.3 V14.4.4 (nosniff) and V14.4.5 (no referrer leaks across sites).
  it('should forbid content sniffing and cross-site referrers', async () => {
    const response = await app.anonymous.get('/api/me');
    expect(response.headers['x-content-type-options']).toBe('nosniff');
    expect(response.headers['referrer-policy']).toBe('same-origin');
    expect(response.headers['x-powered-by']).toBeUndefined();
  });
});

describe('Behind a TLS-terminating proxy', () => {
  let app: TestApp;
  beforeAll(async () => {
    app = await startTestApp({
      template: 'empty',
      environment: { APP_URL: 'https://music.merrowbasin.example', TRUST_PROXY: 'true' },
    });
  });
  afterAll(async () => {
    await app?.close();
  });

  // OWASP ASVS 4.0.3 V3.4.1: session cookies carry the Secure attribute; V9.1.1 with HSTS.
  it('should mark the session cookie Secure and ask browsers to keep to HTTPS', async () => {
    const response = await app.anonymous.get('/auth/sign-in').set('X-Forwarded-Proto', 'https');
    expect(response.status).toBe(302);
    const cookie = ([] as string[]).concat(response.headers['set-cookie'] ?? []).join('\n');
    expect(cookie).toMatch(/^tuttiboard\.sid=/);
    expect(cookie).toMatch(/;\s*Secure/i);
    expect(cookie).toMatch(/;\s*HttpOnly/i);
    expect(response.headers['strict-transport-security']).toMatch(/max-age=\d+/);
  });
});

describe('Behind a TLS-terminating proxy without APP_URL', () => {
  let app: TestApp;
  beforeAll(async () => {
    app = await startTestApp({ template: 'empty', environment: { TRUST_PROXY: 'true' } });
  });
  afterAll(async () => {
    await app?.close();
  });

  // OWASP ASVS 4.0.3 V3.4.1 (Secure cookies) and RFC 6797 §7.2 (HSTS only over secure transport).
  it('should mark the cookie Secure and send HSTS when the proxy says the request was HTTPS', async () => {
    const response = await app.anonymous.get('/auth/sign-in').set('X-Forwarded-Proto', 'https');
    expect(response.status).toBe(302);
    const cookie = ([] as string[]).concat(response.headers['set-cookie'] ?? []).join('\n');
    expect(cookie).toMatch(/^tuttiboard\.sid=/);
    expect(cookie).toMatch(/;\s*Secure/i);
    expect(response.headers['strict-transport-security']).toMatch(/max-age=\d+/);
  });

  it('should leave the cookie plain and send no HSTS over plain HTTP', async () => {
    const response = await app.anonymous.get('/auth/sign-in');
    const cookie = ([] as string[]).concat(response.headers['set-cookie'] ?? []).join('\n');
    expect(cookie).toMatch(/^tuttiboard\.sid=/);
    expect(cookie).not.toMatch(/;\s*Secure/i);
    expect(response.headers['strict-transport-security']).toBeUndefined();
  });
});

describe('An http APP_URL behind an HTTPS proxy', () => {
  it('should warn once when HTTPS requests arrive', async () => {
    const warnings: string[] = [];
    const logger = createLogger('silent');
    logger.warn = ((...parts: unknown[]) => {
      warnings.push(parts.map((part) => (typeof part === 'string' ? part : '')).join(''));
    }) as typeof logger.warn;
    const app = await startTestApp({
      template: 'empty',
      logger,
      environment: { TRUST_PROXY: 'true', APP_URL: 'http://music.merrowbasin.example' },
    });
    try {
      await app.anonymous.get('/api/me');
      expect(warnings).toEqual([]);
      await app.anonymous.get('/api/me').set('X-Forwarded-Proto', 'https');
      await app.anonymous.get('/api/me').set('X-Forwarded-Proto', 'https');
      expect(warnings).toHaveLength(1);
      expect(warnings[0]).toMatch(/APP_URL is http/);
    } finally {
      await app.close();
    }
  });
});
