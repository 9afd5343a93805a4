import { describe, expect, it } from 'vitest';
import { CookieJar } from './cookie-jar.js';

function responseSetting(...cookies: string[]): Response {
  const headers = new Headers();
  for (const cookie of cookies) {
    headers.append('set-cookie', cookie);
  }
  return new Response(null, { headers });
}

describe('CookieJar', () => {
  it('should send a cookie to another port of the same host when it was set there', () => {
    const jar = new CookieJar();

    jar.store('http://127.0.0.1:4310/auth', responseSetting('_session=abc; path=/; httponly'));

    // RFC 6265 §8.5: cookies do not provide isolation by port.
    expect(jar.header('http://127.0.0.1:4300/api/me')).toBe('_session=abc');
    expect(jar.header('http://localhost:4310/auth')).toBeUndefined();
  });

  it('should send a cookie only under its path when a Path is given', () => {
    const jar = new CookieJar();

    jar.store('http://127.0.0.1/', responseSetting('_interaction=1; path=/interaction/xyz'));

    // RFC 6265 §5.1.4 path-match.
    expect(jar.header('http://127.0.0.1/interaction/xyz')).toBe('_interaction=1');
    expect(jar.header('http://127.0.0.1/interaction/xyz/login')).toBe('_interaction=1');
    expect(jar.header('http://127.0.0.1/interaction/xyzzy')).toBeUndefined();
    expect(jar.header('http://127.0.0.1/auth')).toBeUndefined();
  });

  it('should default the path to the request directory when no Path is given', () => {
    const jar = new CookieJar();

    jar.store('http://127.0.0.1/auth/login', responseSetting('state=s1'));

    // RFC 6265 §5.1.4 default-path.
    expect(jar.get('state', 'http://127.0.0.1/auth/callback')).toBe('s1');
    expect(jar.get('state', 'http://127.0.0.1/api/me')).toBeUndefined();
  });

  it('should forget a cookie when it is set again with an expiry in the past', () => {
    const jar = new CookieJar();
    jar.store('http://127.0.0.1/', responseSetting('_session=abc; path=/'));

    jar.store(
      'http://127.0.0.1/',
      responseSetting('_session=; path=/; expires=Thu, 01 Jan 1970 00:00:00 GMT'),
    );

    expect(jar.header('http://127.0.0.1/')).toBeUndefined();
  });

  it('should let Max-Age win over Expires when a cookie has both', () => {
    const jar = new CookieJar();

    jar.store(
      'http://127.0.0.1/',
      responseSetting('kept=1; path=/; max-age=60; expires=Thu, 01 Jan 1970 00:00:00 GMT'),
    );

    // RFC 6265 §5.3 step 3.
    expect(jar.get('kept', 'http://127.0.0.1/')).toBe('1');
  });

  it('should list longer paths first when several cookies apply', () => {
    const jar = new CookieJar();

    jar.store('http://127.0.0.1/', responseSetting('wide=1; path=/', 'narrow=2; path=/auth'));

    // RFC 6265 §5.4 step 2.
    expect(jar.header('http://127.0.0.1/auth/abc')).toBe('narrow=2; wide=1');
  });
});
