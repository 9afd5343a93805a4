import type { Request, Response } from 'express';
import { signedInCookieName } from '@shared/api/signed-in-cookie';

/** As long as the session cookie lives (server/app.ts), so it runs out no later than the session. */
const signedInMaxAge = 8 * 60 * 60 * 1000;

/** Names the signed-in user in the readable cookie (at sign-in, and again on each `/api/me`). */
export function noteSignedIn(request: Request, response: Response, userId: number): void {
  response.cookie(signedInCookieName, String(userId), {
    httpOnly: false,
    sameSite: 'lax',
    secure: request.secure,
    path: '/',
    maxAge: signedInMaxAge,
  });
}

/** Clears the readable cookie (signing out). */
export function clearSignedIn(response: Response): void {
  response.clearCookie(signedInCookieName, { path: '/' });
}
