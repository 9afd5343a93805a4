import type { NextFunction, Request, Response } from 'express';
import { forbidden } from './errors';

const safeMethods = new Set(['GET', 'HEAD', 'OPTIONS']);

/**
 * Cross-site request forgery guard for cookie-authenticated writes: the browser's Origin header
 * (or Sec-Fetch-Site) must say the request came from this site. Bearer-token and cookie-less
 * requests carry no ambient credential, so they pass. OWASP "Cross-Site Request Forgery Prevention Cheat Sheet",
 * "Verifying Origin With Standard Headers".
 */
export function sameOriginWrites(allowedOrigins: () => string[], cookieName: string) {
  return (request: Request, _response: Response, next: NextFunction) => {
    // Only a request carrying the session cookie holds an ambient credential worth forging.
    const carriesSession = (request.get('cookie') ?? '').includes(`${cookieName}=`);
    if (safeMethods.has(request.method) || request.get('authorization') || !carriesSession)
      return next();
    // A guardian's signing page is authorised by the one-time link itself, not by the cookie,
    // and sends no Referrer (so the browser posts "Origin: null").
    if (request.path.startsWith('/agreements/') || request.path.startsWith('/pay/')) return next();
    const origin = request.get('origin');
    const own = `${request.protocol}://${request.host}`;
    if (origin) {
      if (origin === own || allowedOrigins().includes(origin)) return next();
      throw forbidden('This change came from another site, so it was refused.');
    }
    if (request.get('sec-fetch-site') === 'same-origin') return next();
    throw forbidden('This change carried no Origin header, so it was refused.');
  };
}
