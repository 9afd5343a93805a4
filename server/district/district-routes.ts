import { Router, type NextFunction, type Request, type Response } from 'express';
import { districtPatchSchema } from '@shared/api/district';
import { escapeHtml } from '@shared/html/escape-html';
import { plainPage } from '../auth/plain-page';
import { actorOf, requires } from '../core/policy';
import { nothing, parseInput } from '../core/validate';
import type { Database } from '../db/client';
import type { Services } from '../services';
import { districtIdentity, logoPath } from './district-queries';
import { getDistrict, updateDistrict } from './district-service';

/** `/api/district`: every signed-in user reads it; the coordinator changes its settings. */
export function districtRoutes({ db }: Services): Router {
  const router = Router();
  router.get('/district', async (request, response) => {
    actorOf(request);
    parseInput(nothing, request.query, 'The query');
    response.json(await getDistrict(db));
  });
  router.patch('/district', requires('district:settings'), async (request, response) => {
    const patch = parseInput(districtPatchSchema, request.body, 'The change');
    response.json(await updateDistrict(db, actorOf(request), patch));
  });
  return router;
}

// An SVG opened on its own is a document: this policy keeps any script in it from running.
const logoContentSecurityPolicy = "default-src 'none'; style-src 'unsafe-inline'; sandbox";

/**
 * The district's logo, without sign-in (the sign-in and agreement pages show it). Its address
 * carries the logo's version, so it may be cached.
 */
export function districtLogoRoute({ db }: Services): Router {
  const router = Router();
  // The name and logo only, for pages shown before sign-in (the signed-out page).
  router.get('/district-brand', async (_request, response) => {
    const identity = await districtIdentity(db);
    response.set('Cache-Control', 'no-cache').json({
      name: identity?.name ?? null,
      logoUrl: identity?.logo ? `${logoPath}?v=${identity.logo.version}` : null,
    });
  });
  router.get(logoPath, async (_request, response) => {
    const logo = (await districtIdentity(db))?.logo;
    if (!logo) {
      response.status(404).type('text/plain').send('This district has no logo.');
      return;
    }
    response
      .set('Content-Security-Policy', logoContentSecurityPolicy)
      .set('Cache-Control', 'public, max-age=300')
      .type(logo.type)
      .send(logo.bytes);
  });
  return router;
}

/** The page every address answers before `tutti setup` has made the district. */
export function notSetUpPage(): string {
  const command =
    'npx tutti setup --district "Your District Name" --coordinator you@your-district.org';
  return plainPage({
    title: 'This Tuttiboard has not been set up',
    message:
      'There is no district here yet, so nobody can sign in. Whoever runs this server sets it up once, on the server, with:',
    detailHtml: `<pre>${escapeHtml(command)}</pre><p>Then reload this page and sign in as the coordinator named in the command. The README's "Setting up your district" section has the steps.</p>`,
  });
}

/**
 * Answers every page with the not-set-up page while the database has no district; mounted after
 * the API (`/api/me` is 401 as always with nobody signed in) and before the web app. Once a
 * district exists, the check is a cached lookup.
 */
export function requireDistrict(db: Database) {
  return async (request: Request, response: Response, next: NextFunction) => {
    if (request.method !== 'GET' && request.method !== 'HEAD') return next();
    if (await districtIdentity(db)) return next();
    response.status(503).set('Cache-Control', 'no-store').type('html').send(notSetUpPage());
  };
}
