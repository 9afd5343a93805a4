import { CookieJar } from './cookie-jar.js';

export { CookieJar };

const maximumHops = 20;

function isRedirect(response: Response): boolean {
  return response.status >= 300 && response.status < 400 && response.headers.has('location');
}

function signInFormAction(html: string, pageUrl: string): string | undefined {
  const formTag = /<form\b[^>]*\bid="sign-in-form"[^>]*>/.exec(html)?.[0];
  const action = formTag && /\baction="([^"]+)"/.exec(formTag)?.[1];
  return action ? new URL(action.replace(/&amp;/g, '&'), pageUrl).href : undefined;
}

function pageError(html: string): string {
  const error = /<p[^>]*role="alert"[^>]*>([\s\S]*?)<\/p>/.exec(html)?.[1];
  return error?.replace(/<[^>]+>/g, '').trim() ?? 'no error message on the page';
}

/**
 * Signs in through the local identity provider the way a browser would: from `startUrl` (an
 * authorization URL, or an application route that redirects to one) it follows redirects with
 * cookies to the sign-in page, submits `email`, and follows redirects until a URL whose path is
 * `/auth/callback`, which it returns without fetching. When the jar already holds a session at
 * the provider, no sign-in page is shown and the session's account is used.
 */
export async function walkSignIn(
  startUrl: string,
  email: string,
  cookieJar: CookieJar = new CookieJar(),
): Promise<{ callbackUrl: string }> {
  let url = startUrl;
  let submitted = false;
  for (let hop = 0; hop < maximumHops; hop += 1) {
    if (new URL(url).pathname === '/auth/callback') {
      return { callbackUrl: url };
    }
    const response = await cookieJar.fetch(url);
    if (isRedirect(response)) {
      url = new URL(response.headers.get('location') ?? '', url).href;
      continue;
    }
    const html = await response.text();
    const action = response.ok ? signInFormAction(html, url) : undefined;
    if (!action || submitted) {
      throw new Error(`Sign-in stopped at ${url} (HTTP ${response.status}): ${pageError(html)}`);
    }
    submitted = true;
    const answer = await cookieJar.fetch(action, {
      method: 'POST',
      headers: { 'content-type': 'application/x-www-form-urlencoded' },
      body: new URLSearchParams({ email }).toString(),
    });
    if (!isRedirect(answer)) {
      const page = await answer.text();
      throw new Error(`Signing in as ${email} failed (HTTP ${answer.status}): ${pageError(page)}`);
    }
    url = new URL(answer.headers.get('location') ?? '', action).href;
  }
  throw new Error(`Sign-in did not reach /auth/callback within ${maximumHops} redirects`);
}
