import { arrivalOrder } from './db/arrival-order';
import { backupRoutes } from './backup/backup-routes';
import compression from 'compression';
import express, { Router, type Express, type RequestHandler } from 'express';
import session from 'express-session';
import helmet from 'helmet';
import fs from 'node:fs';
import path from 'node:path';
import type { Config } from './config';
import type { DatabaseHandle } from './db/client';
import { createLogger, type Logger } from './logger';
import type { Services } from './services';
import { DatabaseSessionStore } from './auth/session-store';
import { createSignIn, sessionCookieName } from './auth/oidc-sign-in';
import { authenticate } from './auth/authenticate';
import { sameOriginWrites } from './core/same-origin';
import { errorHandler, unknownApiRoute } from './core/error-handler';
import { sessionSecret } from './core/settings';
import { signInLimit, tokenLimits } from './core/rate-limits';
import { meRoutes } from './me/me-routes';
import { schoolsRoutes } from './schools/schools-routes';
import { schoolYearsRoutes } from './school-years/school-years-routes';
import { tokensRoutes } from './tokens/tokens-routes';
import { peopleRoutes } from './people/people-routes';
import { studentsRoutes } from './students/students-routes';
import { ensemblesRoutes } from './ensembles/ensembles-routes';
import { enrollmentsRoutes } from './enrollments/enrollments-routes';
import { gridPreferencesRoutes } from './grid-preferences/grid-preferences-routes';
import { localCommandRoutes } from './cli/local-command-routes';
import { instrumentsRoutes } from './instruments/instruments-routes';
import { loansRoutes } from './loans/loans-routes';
import { agreementPages } from './loans/agreement-pages';
import { repairsRoutes } from './repairs/repairs-routes';
import { countsRoutes } from './counts/counts-routes';
import { planningRoutes } from './planning/planning-routes';
import { oneRosterRoutes } from './oneroster/oneroster-routes';
import { importsRoutes } from './imports/imports-routes';
import { ladderRoutes } from './ladder/ladder-routes';
import { passOffsRoutes } from './pass-offs/pass-offs-routes';
import { takesRoutes } from './takes/takes-routes';
import { analyticsRoutes } from './analytics/analytics-routes';
import { outboxRoutes } from './mail/outbox-routes';
import { reportsRoutes } from './reports/reports-routes';
import { startBackgroundWork } from './reports/background-work';
import { webRoot } from './project-paths';
import { webPages, type WebPages } from './core/web-preloads';
import { precompressedFiles } from './core/precompressed-files';
import { embeddedReads, sendWithEmbeddedReads, sessionActor } from './core/embedded-reads';
import { can } from './core/policy';
import { districtLogoRoute, districtRoutes, requireDistrict } from './district/district-routes';
import { findDistrictRow } from './district/district-queries';
import { feesRoutes, paymentsWebhook } from './payments/fees-routes';
import { payPages } from './payments/pay-pages';

export { webRoot };

/** What createApp needs besides the configuration. */
export interface AppOptions {
  database: DatabaseHandle;
  logger?: Logger;
  /** Serve the built web app (default true when it has been built). */
  serveWeb?: boolean;
  /** The data-folder lock's key that lets local `tutti` commands work through this server. */
  localKey?: string;
}

/** The feature routers, each mounted under /api. */
export const featureRoutes: ((services: Services) => Router)[] = [
  meRoutes,
  districtRoutes,
  schoolsRoutes,
  schoolYearsRoutes,
  tokensRoutes,
  peopleRoutes,
  outboxRoutes,
  reportsRoutes,
  importsRoutes,
  oneRosterRoutes,
  studentsRoutes,
  ensemblesRoutes,
  enrollmentsRoutes,
  gridPreferencesRoutes,
  ladderRoutes,
  passOffsRoutes,
  takesRoutes,
  analyticsRoutes,
  feesRoutes,
  instrumentsRoutes,
  loansRoutes,
  repairsRoutes,
  countsRoutes,
  planningRoutes,
  backupRoutes,
];

/**
 * Runs a session middleware except for API requests that carry an Authorization header: those
 * authenticate by the header alone (server/auth/authenticate.ts answers 401 rather than fall back
 * to a cookie), so loading, starting or refreshing a session for them is wasted work on every
 * scripted or benchmarked call.
 */
function withoutBearerApiRequests(middleware: RequestHandler): RequestHandler {
  return (request, response, next) =>
    request.headers.authorization !== undefined && request.path.startsWith('/api/')
      ? next()
      : middleware(request, response, next);
}

/**
 * Strict-Transport-Security (RFC 6797) on every answer sent over HTTPS — APP_URL's, or the
 * proxy's X-Forwarded-Proto when TRUST_PROXY=true — with helmet's default lifetime (a year);
 * and one warning when HTTPS requests arrive while APP_URL says http, since sign-in redirects
 * and mailed links then point at the insecure address.
 */
function overHttps(config: Config, logger: Logger): RequestHandler {
  const appUrlIsHttps = config.appUrl.startsWith('https:');
  let warned = false;
  return (request, response, next) => {
    if (appUrlIsHttps || request.secure) {
      response.set('Strict-Transport-Security', 'max-age=31536000; includeSubDomains');
    }
    if (request.secure && config.appUrlIsFixed && !appUrlIsHttps && !warned) {
      warned = true;
      logger.warn(
        { appUrl: config.appUrl },
        'Requests arrive over HTTPS but APP_URL is http: set APP_URL to the https address people open.',
      );
    }
    next();
  };
}

/**
 * Helmet's headers with our Content-Security-Policy (CSP Level 3): only our own scripts, styles
 * (and the inline ones Angular and the grid inject), images, fonts and workers; forms may post to
 * the identity provider (sign-out) and the payment service ("Pay the usage fee").
 */
function securityHeaders(config: Config, pages: WebPages): RequestHandler {
  const issuerOrigin = new URL(config.oidcIssuer).origin;
  // "Pay the usage fee" posts here and is redirected on to the payment service's hosted page.
  const paymentOrigins = config.payments
    ? [config.payments.apiUrl ? new URL(config.payments.apiUrl).origin : 'https:']
    : [];
  return helmet({
    contentSecurityPolicy: {
      useDefaults: false,
      directives: {
        defaultSrc: ["'self'"],
        // The index page's one inline script (the screens' preloads), by its hash.
        scriptSrc: ["'self'", () => pages.scriptHashes().join(' ')],
        // Angular's component styles and the grid's theme are injected as <style> elements.
        styleSrc: ["'self'", "'unsafe-inline'"],
        imgSrc: ["'self'", 'data:', 'blob:'],
        fontSrc: ["'self'"],
        connectSrc: ["'self'"],
        mediaSrc: ["'self'", 'blob:'],
        workerSrc: ["'self'", 'blob:'],
        objectSrc: ["'none'"],
        baseUri: ["'self'"],
        frameAncestors: ["'none'"],
        // Sign-out posts here and is redirected on to the identity provider.
        formAction: ["'self'", issuerOrigin, ...paymentOrigins],
      },
    },
    // Sent below, per request: over HTTPS (APP_URL's, or the proxy's X-Forwarded-Proto).
    strictTransportSecurity: false,
    // With no-referrer, browsers send "Origin: null" on form posts and the CSRF check fails.
    referrerPolicy: { policy: 'same-origin' },
  });
}

/** The signed-in session, kept in the database, for every request but a bearer-token API call. */
async function sessions(config: Config, db: Services['db']): Promise<RequestHandler> {
  return withoutBearerApiRequests(
    session({
      name: sessionCookieName,
      secret: await sessionSecret(db, config.sessionSecret),
      store: new DatabaseSessionStore(db),
      resave: false,
      saveUninitialized: false,
      rolling: true,
      // 'auto': Secure whenever the request came over HTTPS, which behind a trusted proxy
      // (TRUST_PROXY=true) is its X-Forwarded-Proto, with or without APP_URL.
      cookie: {
        httpOnly: true,
        sameSite: 'lax',
        secure: config.appUrl.startsWith('https:') ? true : 'auto',
        maxAge: 8 * 60 * 60 * 1000,
      },
    }),
  );
}

/** `/api`: JSON bodies, rate limits, the caller's identity, then every feature's routes. */
function apiRouter(services: Services, localKey: string | undefined): Router {
  const { config, db } = services;
  const api = Router();
  if (localKey) api.use('/local', localCommandRoutes(services, localKey));
  api.use(express.json({ limit: '2mb' }));
  api.use(arrivalOrder);
  api.use(tokenLimits(config.rateLimits.token, config.rateLimits.tokenFailures));
  api.use(authenticate(db));
  api.use((_request, response, next) => {
    response.set('Cache-Control', 'no-store');
    next();
  });
  for (const routes of featureRoutes) api.use(routes(services));
  api.use(unknownApiRoute);
  return api;
}

/**
 * The built web app: its files, and for every other GET (HTML5 routing) the app's index page,
 * which names a screen's code ahead (see `webPages`). For a signed-in user with the screen's
 * capability, the page served at its address also carries the answers of the screen's first reads,
 * read for them as the API would (never for a signed-out request, never stored: the service worker
 * keeps the plain `/index.html` it fetches itself, with the worker's manifest naming its hash).
 */
function webApp({ db, logger }: Services, pages: WebPages): Router {
  const web = Router();
  web.get('/ngsw.json', (_request, response, next) => {
    const manifest = pages.workerManifest();
    if (manifest === undefined) return next();
    response.set('Cache-Control', 'no-cache').type('json').send(manifest);
  });
  web.get('/index.html', (_request, response, next) => {
    const html = pages.index();
    if (html === undefined) return next();
    response.set('Cache-Control', 'no-cache').type('html').send(html);
  });
  web.use(precompressedFiles(webRoot));
  web.use(express.static(webRoot, { index: false, maxAge: '1h', setHeaders: webCacheHeaders }));
  web.get('/{*splat}', async (request, response) => {
    response.set('Cache-Control', 'no-cache');
    const html = pages.index();
    if (html === undefined) return response.sendFile(path.join(webRoot, 'index.html'));
    const screen = pages.screen(request.path);
    const actor = screen && (await sessionActor(db, request));
    if (!screen || !actor || !can(actor, screen.capability))
      return response.type('html').send(html);
    await sendWithEmbeddedReads(
      response,
      html,
      () => embeddedReads(db, actor, screen.reads(request.query)),
      logger,
    );
  });
  return web;
}

/** Builds the Express app: security headers, sessions, sign-in, the API and the web app. */
export async function createApp(config: Config, options: AppOptions): Promise<Express> {
  const logger = options.logger ?? createLogger(config.logLevel);
  const { db } = options.database;
  const services: Services = { config, db, database: options.database, logger };
  const app = express();
  app.disable('x-powered-by');
  // API answers are sent with Cache-Control: no-store, so nothing revalidates them; an ETag
  // would hash every answer's body for no one. Static files keep theirs (express.static).
  app.set('etag', false);
  // One hop: the district's TLS-terminating proxy. Trusting every X-Forwarded-For hop would let
  // a client pick its own address and step around the rate limits.
  app.set('trust proxy', config.trustProxy ? 1 : false);
  app.locals['services'] = services;
  // Loads the district's time zone before the first request counts a day in it.
  await findDistrictRow(db);

  app.use(arrivalOrder);
  const serveWeb = options.serveWeb ?? fs.existsSync(path.join(webRoot, 'index.html'));
  const pages = webPages(serveWeb ? webRoot : null);
  app.use(securityHeaders(config, pages));
  app.use(overHttps(config, logger));
  // Brotli or gzip (RFC 9110 §8.4, content codings; RFC 7932 for brotli) for every compressible
  // answer over 1 kB: the app's scripts, styles and the API's JSON. On a slow phone network the
  // bytes, not the server, are what the first screen waits for.
  app.use(compression());

  // The payment service's signed events: raw body, no session, no cookie, no CSRF check.
  app.use(paymentsWebhook(services));
  app.use(await sessions(config, db));
  const signIn = createSignIn(config, db, logger);
  app.use(withoutBearerApiRequests(signIn.initialize), withoutBearerApiRequests(signIn.session));
  app.use(arrivalOrder);
  app.use(sameOriginWrites(() => [new URL(config.appUrl).origin], sessionCookieName));
  app.use(['/auth/sign-in', '/auth/callback'], signInLimit(config.rateLimits.signIn));
  app.use(signIn.router);

  app.use('/api', apiRouter(services, options.localKey));
  app.use(agreementPages(services));
  app.use(districtLogoRoute(services));
  app.use(requireDistrict(db));
  app.use(payPages(services));
  if (serveWeb) app.use(webApp(services, pages));
  app.use(errorHandler(logger));
  // The mail worker and report scheduler; server/main.ts and the test harness call it on close.
  app.locals['stop'] = startBackgroundWork(services);
  return app;
}

/**
 * The files that name the app's version are checked with the server on every use: the service
 * worker's own script and its manifest (Angular's service worker guide: "ngsw.json" must not be
 * cached by the browser or a proxy), the web app manifest and the index page. A worker that read
 * a stale ngsw.json would keep offering the old version.
 */
const alwaysRevalidated = new Set([
  'index.html',
  'ngsw.json',
  'ngsw-worker.js',
  'safety-worker.js',
  'worker-basic.min.js',
  'manifest.webmanifest',
]);

/**
 * The build's own file names carry a hash of their content (Angular's `outputHashing: "all"`:
 * `main-3SDGA755.js`, `styles-….css`, `media/…-….woff2` from esbuild, and `chunk-6zhjmF-q.js`
 * from the chunk optimizer's rolldown pass, whose hashes are eight base64url characters), so a
 * name never changes content: a year's lifetime and `immutable` (RFC 8246) spare the repeat
 * visit's revalidation round trips.
 */
export const hashedFileName = /-[A-Za-z0-9_-]{8}\.(?:js|css|woff2?|ttf|svg|png)$/;

function webCacheHeaders(response: express.Response, filePath: string): void {
  const name = path.basename(filePath);
  if (alwaysRevalidated.has(name)) response.setHeader('Cache-Control', 'no-cache');
  else if (hashedFileName.test(name))
    response.setHeader('Cache-Control', 'public, max-age=31536000, immutable');
}
