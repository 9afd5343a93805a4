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

  const verifyTokens = async (
    tokens: Parameters<VerifyFunctionWithRequest>[1],
    verified: Parameters<VerifyFunctionWithRequest>[2],
  ): Promise<void> => {
    const configuration = await discovered!;
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
  const verify: VerifyFunctionWithRequest = (_request, tokens, verified) => {
    verifyTokens(tokens, verified).catch((error: unknown) => verified(error));
  };

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
              verify,
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

  async function brand(): Promise<string | undefined> {
    return (await districtIdentity(db).catch(() => undefined))?.name;
  }

  async function providerDown(response: Response, error: unknown) {
    logger.warn({ err: error, issuer: config.oidcIssuer }, 'identity provider unreachable');
    response
      .status(503)
      .type('html')
      .send(
        plainPage({
          brand: await brand(),
          title: 'Sign-in is not available right now',
          message: `The district's sign-in service (${config.oidcIssuer}) is not answering. Nothing you had saved is affected. Try again in a minute; if it goes on, tell the district's IT help desk.`,
          action: { href: '/auth/sign-in', label: 'Try again' },
        }),
      );
  }

  const router = Router();

  router.get('/auth/sign-in', async (request: Request, response: Response, next: NextFunction) => {
    try {
      await discover();
    } catch (error) {
      return await providerDown(response, error);
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
      return await providerDown(response, error);
    }
    const callbackURL = `${publicOrigin(config, request)}/auth/callback`;
    const returnTo = safeReturnPath(request.session.returnTo);
    authenticator.authenticate(
      strategyName,
      { callbackURL } as passport.AuthenticateOptions,
      (error: unknown, user: SessionUser | false, info?: { message?: string }) => {
        if (error || !user) {
          if (error) logger.warn({ err: error }, 'sign-in failed');
          void brand().then((district) =>
            response
              .status(error ? 502 : 403)
              .type('html')
              .send(
                plainPage({
                  brand: district,
                  title: 'You are not signed in',
                  message:
                    info?.message ??
                    'The sign-in could not be completed. Start again from the sign-in page.',
                  action: { href: '/auth/sign-in', label: 'Sign in again' },
                }),
              ),
          );
          return;
        }
        // req.logIn regenerates the session, so a session id planted before sign-in is dropped.
        request.logIn(user, (loginError) => {
          if (loginError) return next(loginError);
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

  return { router, initialize: authenticator.initialize(), session: authenticator.session() };
}

/** The app's own session cookie; named so it never collides with the identity provider's on localhost. */
export const sessionCookieName = 'tuttiboard.sid';
