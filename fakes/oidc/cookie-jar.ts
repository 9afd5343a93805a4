interface StoredCookie {
  name: string;
  value: string;
  /** The host the cookie came from, or the Domain it was set for. */
  domain: string;
  /** Whether the cookie also goes to the subdomains of `domain` (it had a Domain attribute). */
  includeSubdomains: boolean;
  path: string;
  /** Milliseconds since the epoch, or undefined for a session cookie. */
  expiresAt: number | undefined;
}

// RFC 6265 §5.1.4: the default path is the request path up to, not including, its last slash.
function defaultPath(url: URL): string {
  const lastSlash = url.pathname.lastIndexOf('/');
  return lastSlash <= 0 ? '/' : url.pathname.slice(0, lastSlash);
}

// RFC 6265 §5.1.4 path-match.
function pathMatches(requestPath: string, cookiePath: string): boolean {
  if (requestPath === cookiePath) {
    return true;
  }
  return (
    requestPath.startsWith(cookiePath) &&
    (cookiePath.endsWith('/') || requestPath.charAt(cookiePath.length) === '/')
  );
}

function parseSetCookie(header: string, url: URL, now: number): StoredCookie | undefined {
  const [pair = '', ...attributes] = header.split(';');
  const equals = pair.indexOf('=');
  if (equals <= 0) {
    return undefined;
  }
  const cookie: StoredCookie = {
    name: pair.slice(0, equals).trim(),
    value: pair.slice(equals + 1).trim(),
    domain: url.hostname,
    includeSubdomains: false,
    path: defaultPath(url),
    expiresAt: undefined,
  };
  let maxAgeSeen = false;
  for (const attribute of attributes) {
    const separator = attribute.indexOf('=');
    const key = (separator === -1 ? attribute : attribute.slice(0, separator)).trim().toLowerCase();
    const value = separator === -1 ? '' : attribute.slice(separator + 1).trim();
    if (key === 'path' && value.startsWith('/')) {
      cookie.path = value;
    } else if (key === 'domain' && value) {
      cookie.domain = value.replace(/^\./, '').toLowerCase();
      cookie.includeSubdomains = true;
    } else if (key === 'max-age' && /^-?\d+$/.test(value)) {
      // RFC 6265 §5.3 step 3: Max-Age wins over Expires.
      maxAgeSeen = true;
      cookie.expiresAt = now + Number(value) * 1000;
    } else if (key === 'expires' && !maxAgeSeen && !Number.isNaN(Date.parse(value))) {
      cookie.expiresAt = Date.parse(value);
    }
  }
  return cookie;
}

/**
 * A small cookie store for test clients that talk HTTP the way a browser does (RFC 6265): it
 * keeps cookies by domain, path and name, drops expired ones and, like a browser, ignores the
 * port, so one jar serves an application and its identity provider on the same host.
 */
export class CookieJar {
  private readonly cookies = new Map<string, StoredCookie>();

  /** Stores every `Set-Cookie` of a response to a request for `url`. */
  store(url: string | URL, response: Response): void {
    const requestUrl = new URL(url);
    const now = Date.now();
    for (const header of response.headers.getSetCookie()) {
      const cookie = parseSetCookie(header, requestUrl, now);
      if (!cookie) {
        continue;
      }
      const key = `${cookie.domain};${cookie.path};${cookie.name}`;
      if (cookie.expiresAt !== undefined && cookie.expiresAt <= now) {
        this.cookies.delete(key);
      } else {
        this.cookies.set(key, cookie);
      }
    }
  }

  /** The `Cookie` header to send with a request for `url`, or undefined when none applies. */
  header(url: string | URL): string | undefined {
    const requestUrl = new URL(url);
    const hostname = requestUrl.hostname.toLowerCase();
    const now = Date.now();
    const matching = [...this.cookies.values()]
      .filter((cookie) => cookie.expiresAt === undefined || cookie.expiresAt > now)
      .filter((cookie) =>
        cookie.includeSubdomains
          ? hostname === cookie.domain || hostname.endsWith(`.${cookie.domain}`)
          : hostname === cookie.domain,
      )
      .filter((cookie) => pathMatches(requestUrl.pathname, cookie.path))
      // RFC 6265 §5.4 step 2: longer paths first.
      .sort((first, second) => second.path.length - first.path.length);
    return matching.length
      ? matching.map((cookie) => `${cookie.name}=${cookie.value}`).join('; ')
      : undefined;
  }

  /** The value of the cookie named `name` that a request for `url` would carry. */
  get(name: string, url: string | URL): string | undefined {
    const prefix = `${name}=`;
    return this.header(url)
      ?.split('; ')
      .find((pair) => pair.startsWith(prefix))
      ?.slice(prefix.length);
  }

  /**
   * Fetches `url` with this jar's cookies and stores the cookies of the answer. Redirects are
   * not followed, so every hop's cookies are seen; read the `Location` header to go on.
   */
  async fetch(url: string | URL, init: RequestInit = {}): Promise<Response> {
    const headers = new Headers(init.headers);
    const cookie = this.header(url);
    if (cookie !== undefined) {
      headers.set('cookie', cookie);
    }
    const response = await fetch(url, { ...init, headers, redirect: 'manual' });
    this.store(url, response);
    return response;
  }
}
