import type { Provider } from 'oidc-provider';

const loopbackHostnames = new Set(['127.0.0.1', 'localhost', '[::1]']);

/** The path the application receives authorization responses on. */
export const callbackPath = '/auth/callback';

/** Whether `value` is an http(s) URL on a loopback host (RFC 8252 §7.3), without a fragment. */
export function isLoopbackUrl(value: string): boolean {
  if (!URL.canParse(value)) {
    return false;
  }
  const url = new URL(value);
  return (
    (url.protocol === 'http:' || url.protocol === 'https:') &&
    loopbackHostnames.has(url.hostname) &&
    url.hash === '' &&
    url.username === '' &&
    url.password === ''
  );
}

/** Whether `value` is the application's callback on a loopback host, on any port. */
export function isLoopbackCallback(value: string): boolean {
  return isLoopbackUrl(value) && new URL(value).pathname === callbackPath;
}

/**
 * Lets this provider's clients use any loopback callback and any loopback post-logout URL, since
 * the application runs on ephemeral ports in tests. Registered URIs stay allowed as well.
 */
export function allowLoopbackRedirects(provider: Provider): void {
  const prototype = provider.Client.prototype;
  const registeredRedirectAllowed = prototype.redirectUriAllowed;
  const registeredPostLogoutAllowed = prototype.postLogoutRedirectUriAllowed;
  prototype.redirectUriAllowed = function redirectUriAllowed(value: string): boolean {
    return isLoopbackCallback(value) || registeredRedirectAllowed.call(this, value);
  };
  prototype.postLogoutRedirectUriAllowed = function postLogoutRedirectUriAllowed(
    value: string,
  ): boolean {
    return isLoopbackUrl(value) || registeredPostLogoutAllowed.call(this, value);
  };
}
