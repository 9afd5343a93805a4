import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import {
  allowInsecureRequests,
  authorizationCodeGrant,
  buildAuthorizationUrl,
  calculatePKCECodeChallenge,
  ClientSecretBasic,
  type Configuration,
  discovery,
  fetchUserInfo,
  randomPKCECodeVerifier,
} from 'openid-client';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CookieJar, demoAccounts, startOidcFake, walkSignIn, type OidcFake } from './index.js';

const clientId = 'tuttiboard';
const clientSecret = 'tuttiboard-local-secret';
const callback = 'http://127.0.0.1:45999/auth/callback';

let fake: OidcFake;
let client: Configuration;

async function authorizationUrl(
  parameters: Record<string, string> = {},
): Promise<{ url: URL; verifier: string }> {
  const verifier = randomPKCECodeVerifier();
  const url = buildAuthorizationUrl(client, {
    redirect_uri: callback,
    scope: 'openid email profile',
    code_challenge: await calculatePKCECodeChallenge(verifier),
    code_challenge_method: 'S256',
    state: 'state-of-this-test',
    ...parameters,
  });
  return { url, verifier };
}

/**
 * Follows redirects from `start` as a browser would, until a page answers or the redirects reach
 * the application's callback, which is not fetched (no server listens there).
 */
async function openPage(
  start: string,
  jar: CookieJar,
): Promise<{ url: string; response: Response | undefined }> {
  let url = start;
  for (let hop = 0; hop < 10; hop += 1) {
    if (new URL(url).pathname === '/auth/callback') {
      return { url, response: undefined };
    }
    const response = await jar.fetch(url);
    const location = response.headers.get('location');
    if (!location) {
      return { url, response };
    }
    url = new URL(location, url).href;
  }
  throw new Error('too many redirects');
}

beforeAll(async () => {
  fake = await startOidcFake({ port: 0 });
  client = await discovery(new URL(fake.issuer), clientId, clientSecret, undefined, {
    execute: [allowInsecureRequests],
  });
});

afterAll(async () => {
  await fake.close();
});

describe('startOidcFake', () => {
  it('should return the account e-mail and name from userinfo when signed in with PKCE', async () => {
    const { url, verifier } = await authorizationUrl();
    const account = demoAccounts[1]!;

    const { callbackUrl } = await walkSignIn(url.href, account.email);
    const callbackWithCode = new URL(callbackUrl);
    expect(`${callbackWithCode.origin}${callbackWithCode.pathname}`).toBe(callback);
    expect(callbackWithCode.searchParams.get('code')).toBeTruthy();

    const tokens = await authorizationCodeGrant(client, callbackWithCode, {
      pkceCodeVerifier: verifier,
      expectedState: 'state-of-this-test',
    });
    const subject = tokens.claims()?.sub;
    expect(subject).toBe(account.email);
    // OpenID Connect Core 1.0 §5.3.2: the UserInfo response carries the claims the scopes grant.
    const userInfo = await fetchUserInfo(client, tokens.access_token, subject!);
    expect(userInfo.email).toBe(account.email);
    expect(userInfo.name).toBe(account.name);
    expect(userInfo.email_verified).toBe(true);
  });

  it('should accept client_secret_basic at the token endpoint when the client uses it', async () => {
    const basicClient = await discovery(
      new URL(fake.issuer),
      clientId,
      undefined,
      ClientSecretBasic(clientSecret),
      { execute: [allowInsecureRequests] },
    );
    const { url, verifier } = await authorizationUrl();
    const { callbackUrl } = await walkSignIn(url.href, 'technician@merrowbasin.example');

    const tokens = await authorizationCodeGrant(basicClient, new URL(callbackUrl), {
      pkceCodeVerifier: verifier,
      expectedState: 'state-of-this-test',
    });

    expect(tokens.claims()?.sub).toBe('technician@merrowbasin.example');
  });

  it('should list every demo account on a script-free sign-in page when sign-in starts', async () => {
    const { url } = await authorizationUrl();

    const response = (await openPage(url.href, new CookieJar())).response!;
    const html = await response.text();

    expect(response.status).toBe(200);
    expect(html).toContain('Sign in — local identity provider for development');
    for (const account of demoAccounts) {
      expect(html).toContain(account.email);
      expect(html).toContain(account.name);
      expect(html).toContain(account.role);
    }
    expect(html).not.toMatch(/<script/i);
    expect(html).not.toMatch(/(src|href)="https?:/);
    expect(response.headers.get('content-security-policy')).toContain("default-src 'none'");
  });

  it('should show an error and give no code when the e-mail is not an account', async () => {
    const { url } = await authorizationUrl();
    const jar = new CookieJar();
    const { url: pageUrl } = await openPage(url.href, jar);

    const answer = await jar.fetch(`${pageUrl}/login`, {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded' },
      body: new URLSearchParams({ email: 'nobody@merrowbasin.example' }).toString(),
    });
    const html = await answer.text();

    expect(answer.status).toBe(400);
    expect(answer.headers.get('location')).toBeNull();
    expect(html).toContain(
      'There is no account with the e-mail address nobody@merrowbasin.example',
    );
    expect(html).not.toContain('code=');
    await expect(walkSignIn(url.href, 'nobody@merrowbasin.example')).rejects.toThrow(/no account/);
  });

  it('should sign in by typed e-mail regardless of case when the address is an account', async () => {
    const { url } = await authorizationUrl();

    const { callbackUrl } = await walkSignIn(url.href, '  Coordinator@MerrowBasin.example ');

    expect(new URL(callbackUrl).searchParams.get('code')).toBeTruthy();
  });

  it('should show an error page when the interaction is unknown to the browser', async () => {
    const response = await fetch(`${fake.issuer}/interaction/not-a-real-interaction`);
    const html = await response.text();

    expect(response.status).toBe(400);
    expect(html).toContain('This sign-in cannot go on');
    expect(html).not.toContain('id="sign-in-form"');
  });

  it('should refuse to redirect when the redirect_uri is not on a loopback host', async () => {
    const { url } = await authorizationUrl({
      redirect_uri: 'http://tuttiboard.example/auth/callback',
    });

    const response = await fetch(url, { redirect: 'manual' });
    const html = await response.text();

    // RFC 6749 §4.1.2.1: with an invalid redirect URI the server must not redirect the agent.
    expect(response.status).toBe(400);
    expect(response.headers.get('location')).toBeNull();
    expect(html).toContain('invalid_redirect_uri');
  });

  it('should refuse to redirect when a loopback redirect_uri has another path', async () => {
    const { url } = await authorizationUrl({ redirect_uri: 'http://localhost:45999/elsewhere' });

    const response = await fetch(url, { redirect: 'manual' });

    expect(response.status).toBe(400);
    expect(response.headers.get('location')).toBeNull();
  });

  it('should accept localhost and [::1] callbacks on any port when the path is /auth/callback', async () => {
    for (const redirectUri of [
      'http://localhost:1234/auth/callback',
      'http://[::1]:8080/auth/callback',
    ]) {
      const { url } = await authorizationUrl({ redirect_uri: redirectUri });

      const { callbackUrl } = await walkSignIn(url.href, 'viewer.trhs@merrowbasin.example');

      expect(callbackUrl.startsWith(`${redirectUri}?code=`)).toBe(true);
    }
  });

  it('should answer invalid_request and no code when the PKCE challenge is missing', async () => {
    const url = buildAuthorizationUrl(client, {
      redirect_uri: callback,
      scope: 'openid email profile',
      state: 'state-of-this-test',
    });

    const response = await fetch(url, { redirect: 'manual' });
    const location = new URL(response.headers.get('location')!);

    // RFC 7636 §4.4.1: a server that requires PKCE answers invalid_request without a challenge.
    expect(location.searchParams.get('error')).toBe('invalid_request');
    expect(location.searchParams.get('code')).toBeNull();
  });

  it('should send access_denied to the callback when the person cancels the sign-in', async () => {
    const { url } = await authorizationUrl();
    const jar = new CookieJar();
    const { url: pageUrl } = await openPage(url.href, jar);

    const answer = await jar.fetch(`${pageUrl}/abort`, { method: 'POST' });
    const { url: callbackUrl } = await openPage(
      new URL(answer.headers.get('location')!, pageUrl).href,
      jar,
    );

    // RFC 6749 §4.1.2.1: a refused request comes back with error=access_denied.
    expect(new URL(callbackUrl).searchParams.get('error')).toBe('access_denied');
  });

  it('should sign out and return to a loopback URL when RP-initiated logout is confirmed', async () => {
    const jar = new CookieJar();
    const { url } = await authorizationUrl();
    await walkSignIn(url.href, 'director.qhms@merrowbasin.example', jar);
    const signedOut = 'http://127.0.0.1:45999/signed-out';
    const endSession = new URL(client.serverMetadata().end_session_endpoint!);
    endSession.search = new URLSearchParams({
      client_id: clientId,
      post_logout_redirect_uri: signedOut,
    }).toString();

    const confirmation = await jar.fetch(endSession);
    const html = await confirmation.text();
    const action = /<form id="op.logoutForm" method="post" action="([^"]+)"/.exec(html)?.[1];
    const xsrf = /name="xsrf" value="([^"]+)"/.exec(html)?.[1];
    expect(confirmation.status).toBe(200);
    expect(html).not.toMatch(/<script/i);
    expect(action && xsrf).toBeTruthy();
    const answer = await jar.fetch(new URL(action!, endSession), {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded' },
      body: new URLSearchParams({ xsrf: xsrf!, logout: 'yes' }).toString(),
    });

    // OpenID Connect RP-Initiated Logout 1.0 §3: the OP redirects to post_logout_redirect_uri.
    expect(answer.headers.get('location')).toBe(signedOut);
    const { response } = await openPage(url.href, jar);
    expect(await response!.text()).toContain('id="sign-in-form"');
  });

  it('should refuse logout when the post_logout_redirect_uri is not on a loopback host', async () => {
    const endSession = new URL(client.serverMetadata().end_session_endpoint!);
    endSession.search = new URLSearchParams({
      client_id: clientId,
      post_logout_redirect_uri: 'https://tuttiboard.example/signed-out',
    }).toString();

    const response = await fetch(endSession, { redirect: 'manual' });

    expect(response.status).toBe(400);
    expect(response.headers.get('location')).toBeNull();
  });

  it('should keep the signing key when restarted with the same key file', async () => {
    const folder = mkdtempSync(join(tmpdir(), 'oidc-fake-'));
    const keyFile = join(folder, 'signing-key.json');
    try {
      const first = await startOidcFake({ port: 0, keyFile });
      const firstKeys = await (await fetch(`${first.issuer}/jwks`)).json();
      await first.close();
      const second = await startOidcFake({ port: 0, keyFile });
      const secondKeys = await (await fetch(`${second.issuer}/jwks`)).json();
      await second.close();

      expect(firstKeys.keys).toHaveLength(1);
      expect(firstKeys.keys[0].d).toBeUndefined();
      expect(secondKeys).toEqual(firstKeys);
    } finally {
      rmSync(folder, { recursive: true, force: true });
    }
  });
});
