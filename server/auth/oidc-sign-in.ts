import { Router, type Request, type Response, type NextFunction } from 'express';
import passport from 'passport';
import * as client from 'openid-client';
import { Strategy, type VerifyFunctionWithRequest } from 'openid-client/passport';
import { eq } from 'drizzle-orm';
import type { Config } from '../config';
import type { Database } from '../db/client';
import { users } from '../db/schema/index';
import type { Logger } from '../logger';
import { findUserByEmail } from '../people/people-queries';
import { recordAudit } from '../core/audit';
import { plainPage } from './plain-page';
import { clearSignedIn, noteSignedIn } from './signed-in-cookie';
import { districtIdentity } from '../district/district-queries';

const strategyName = 'district-oidc';

/** What the session keeps about a signed-in user. */
export interface SessionUser {
  userId: number;
  idToken?: string;
}

declare module 'express-session' {
  interface SessionData {
    returnTo?: string;
  }
}

/** The origin people reach the app at: APP_URL when set, else the request's own. */
export function publicOrigin(config: Config, request: Request): string {
  if (config.appUrlIsFixed) return new URL(config.appUrl).origin;
  return `${request.protocol}://${request.host}`;
}

/** Only same-site paths are followed after sign-in, never another host. */
function safeReturnPath(value: unknown): string {
  return typeof value === 'string' && value.startsWith('/') && !value.startsWith('//')
    ? value
    : '/';
}

/**
 * Sign-in through the district's OpenID Connect provider (authorization code flow with PKCE,
 * through openid-client's passport strategy). Discovery runs on first use and again after a
 * failure, so the app starts even while the provider is down.
 */
export function createSignIn(config: Config, db: Database, logger: Logger) {
  const authenticator = new passport.Passport();
  let discovered: Promise<client.Configuration> | undefined;

  authenticator.serializeUser((user, done) => done(null, user));
  authenticator.deserializeUser((user: SessionUser, done) => done(null, user));

  function discover(): Promise<client.Configuration> {
    if (!discovered) {
      const execute = config.oidcIssuer.startsWith('http:') ? [client.allowInsecureRequests] : [];
      discovered = client
        .discovery(
          new URL(config.oidcIssuer),
          config.oidcClientId,
          config.oidcClientSecret,
          undefined,
          { execute, timeout: 5 },
        )
        .then((configuration) => {
          authenticator.use(
            strategyName,
            new Strategy(
              { config: configuration, scope: 'openid email profile', passReqToCallback: true },
              verifierFor(db, configuration),
            ),
          );
          return configuration;
        })
        .catch((error: unknown) => {
          discovered = undefined;
          throw error;
        });
    }
    return discovered;
  }

  const router = signInRouter({ config, db, logger, authenticator, discover });
  return { router, initialize: authenticator.initialize(), session: authenticator.session() };
}

/**
 * The strategy's verify step: the provider's user is a Tuttiboard user when their e-mail names an
 * active one; the sign-in is stamped on the user and recorded in the history.
 */
function verifierFor(db: Database, configuration: client.Configuration): VerifyFunctionWithRequest {
  const verifyTokens = async (
    tokens: Parameters<VerifyFunctionWithRequest>[1],
    verified: Parameters<VerifyFunctionWithRequest>[2],
  ): Promise<void> => {
    const claims = tokens.claims();
    if (!claims)
      return verified(null, false, { message: 'The sign-in answer carried no identity.' });
    const info = await client.fetchUserInfo(configuration, tokens.access_token, claims.sub);
    const email = typeof info.email === 'string' ? info.email : '';
    const user = email ? await findUserByEmail(db, email) : undefined;
    if (!user || !user.active) {
      return verified(null, false, {
        message: `${email || 'This account'} has no Tuttiboard access. Ask the district music coordinator to add you.`,
      });
    }
    await db.update(users).set({ lastSignInAt: new Date() }).where(eq(users.id, user.id));
    await recordAudit(db, null, { action: 'sign-in', entity: 'user', entityId: user.id });
    const sessionUser: SessionUser = { userId: user.id, idToken: tokens.id_token };
    verified(null, sessionUser);
  };
  // The strategy reads verify's callback, not a promise: a failure goes to the callback too.
  return (_request, tokens, verified) => {
    verifyTokens(tokens, verified).catch((error: unknown) => verified(error));
  };
}

interface SignInParts {
  config: Config;
  db: Database;
  logger: Logger;
  authenticator: passport.Authenticator;
  discover: () => Promise<client.Configuration>;
}

async function districtName(db: Database): Promise<string | undefined> {
  return (await districtIdentity(db).catch(() => undefined))?.name;
}

/** The page a sign-in gets while the identity provider does not answer (503). */
async function providerDown(
  { config, db, logger }: SignInParts,
  response: Response,
  error: unknown,
) {
  logger.warn({ err: error, issuer: config.oidcIssuer }, 'identity provider unreachable');
  response
    .status(503)
    .type('html')
    .send(
      plainPage({
        brand: await districtName(db),
        title: 'Sign-in is not available right now',
        message: `The district's sign-in service (${config.oidcIssuer}) is not answering. Nothing you had saved is affected. Try again in a minute; if it goes on, tell the district's IT help desk.`,
        action: { href: '/auth/sign-in', label: 'Try again' },
      }),
    );
}

/** The page a refused or failed sign-in gets: 502 when it failed, 403 when it was refused. */
async function notSignedIn(db: Database, response: Response, failed: boolean, message?: string) {
  response
    .status(failed ? 502 : 403)
    .type('html')
    .send(
      plainPage({
        brand: await districtName(db),
        title: 'You are not signed in',
        message:
          message ?? 'The sign-in could not be completed. Start again from the sign-in page.',
        action: { href: '/auth/sign-in', label: 'Sign in again' },
      }),
    );
}

/** The routes of the sign-in: start, the provider's callback, and sign-out. */
function signInRouter(parts: SignInParts): Router {
  const { config, logger, authenticator, discover } = parts;
  const router = Router();

  router.get('/auth/sign-in', async (request: Request, response: Response, next: NextFunction) => {
    try {
      await discover();
    } catch (error) {
      return await providerDown(parts, response, error);
    }
    request.session.returnTo = safeReturnPath(request.query['returnTo']);
    const callbackURL = `${publicOrigin(config, request)}/auth/callback`;
    authenticator.authenticate(strategyName, { callbackURL } as passport.AuthenticateOptions)(
      request,
      response,
      next,
    );
  });

  router.get('/auth/callback', async (request: Request, response: Response, next: NextFunction) => {
    try {
      await discover();
    } catch (error) {
      return await providerDown(parts, response, error);
    }
    const callbackURL = `${publicOrigin(config, request)}/auth/callback`;
    const returnTo = safeReturnPath(request.session.returnTo);
    authenticator.authenticate(
      strategyName,
      { callbackURL } as passport.AuthenticateOptions,
      (error: unknown, user: SessionUser | false, info?: { message?: string }) => {
        if (error || !user) {
          if (error) logger.warn({ err: error }, 'sign-in failed');
          void notSignedIn(parts.db, response, Boolean(error), info?.message);
          return;
        }
        // req.logIn regenerates the session, so a session id planted before sign-in is dropped.
        request.logIn(user, (loginError) => {
          if (loginError) return next(loginError);
          noteSignedIn(request, response, user.userId);
          response.redirect(returnTo);
        });
      },
    )(request, response, next);
  });

  router.post('/auth/sign-out', (request: Request, response: Response, next: NextFunction) => {
    const user = request.user as SessionUser | undefined;
    request.logout((logoutError) => {
      if (logoutError) return next(logoutError);
      request.session.destroy(() => {
        response.clearCookie(sessionCookieName);
        clearSignedIn(response);
        const signedOut = `${publicOrigin(config, request)}/signed-out`;
        discover()
          .then((configuration) => {
            const url = client.buildEndSessionUrl(configuration, {
              post_logout_redirect_uri: signedOut,
              ...(user?.idToken ? { id_token_hint: user.idToken } : {}),
            });
            response.redirect(303, url.href);
          })
          .catch(() => response.redirect(303, signedOut));
      });
    });
  });

  return router;
}

/** The app's own session cookie; named so it never collides with the identity provider's on localhost. */
export const sessionCookieName = 'tuttiboard.sid';
