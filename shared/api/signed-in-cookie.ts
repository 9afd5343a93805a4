/**
 * The cookie the web app can read naming the user this browser's session belongs to (set by the
 * server at sign-in and on `/api/me`, cleared at sign-out), so a copy kept on the device is shown
 * only to the user it was kept for.
 */
export const signedInCookieName = 'tuttiboard.user';
