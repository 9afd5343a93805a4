import type { Request, Response } from 'express';

/**
 * A cookie the web app can read (not HttpOnly) naming the user this browser's session belongs
 * to. It carries only the user's id, which is not secret; the session itself stays in the
 * HttpOnly session cookie. The app paints a screen from the copy this device kept of the last
 * visit only when that copy belongs to the user named here, so a copy left by one user is never
 * shown after another signs in on the same browser. The server still answers every read.
 */
export const signedInCookieName = 'tuttiboard.user';

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
