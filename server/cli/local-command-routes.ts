import express, { Router, type NextFunction, type Request, type Response } from 'express';
import { timingSafeEqual } from 'node:crypto';
import { z } from 'zod';
import type { Services } from '../services';
import { HttpError } from '../core/errors';
import { parseInput } from '../core/validate';
import { findUserByEmail } from '../people/people-queries';
import { issueToken } from '../tokens/tokens-service';
import { localImportHandlers, runOneRosterSync } from '../imports/local-import';
import { AlreadySetUpError, setUpDistrict } from '../district/district-service';
import { answerBackup } from '../backup/backup-routes';
import { yearStartInputSchema } from '@shared/api/school-year';
import { startSchoolYear } from '../school-years/year-start';

/** The header a local `tutti` command sends with the key from the data folder's lock file. */
export const localKeyHeader = 'x-tutti-local-key';

function sameKey(given: string, expected: string): boolean {
  const a = Buffer.from(given);
  const b = Buffer.from(expected);
  return a.length === b.length && timingSafeEqual(a, b);
}

/**
 * Routes for `tutti` commands run on the server's own machine while the server holds the data
 * folder: instead of opening the folder beside it (which would corrupt it), they ask the server.
 */
export function localCommandRoutes(services: Services, localKey: string): Router {
  const { db, database } = services;
  const router = Router();
  router.use((request: Request, _response: Response, next: NextFunction) => {
    const given = request.get(localKeyHeader);
    if (!given || !sameKey(given, localKey)) {
      throw new HttpError(403, 'forbidden', 'Local commands need the key from the data folder.');
    }
    next();
  });
  router.use(express.json({ limit: '1mb' }));
  router.post('/tokens', async (request, response) => {
    const { email } = parseInput(
      z.object({ email: z.string().min(3) }),
      request.body,
      'The request',
    );
    const user = await findUserByEmail(db, email);
    if (!user || !user.active)
      throw new HttpError(404, 'not_found', `No active user has the e-mail ${email}.`);
    const { token, expiresAt } = await issueToken(db, user.id, 'tutti token');
    response
      .status(201)
      .json({ token, name: user.name, role: user.role, expiresAt: expiresAt.toISOString() });
  });
  router.post('/setup', async (request, response) => {
    try {
      response.status(201).json(await setUpDistrict(db, request.body as never));
    } catch (error) {
      if (error instanceof AlreadySetUpError) throw new HttpError(409, 'conflict', error.message);
      throw error;
    }
  });
  router.post('/imports', ...localImportHandlers(database));
  router.post('/oneroster-sync', async (request, response) => {
    const flags = parseInput(
      z.strictObject({
        dryRun: z.boolean().default(false),
        skipInvalid: z.boolean().default(false),
      }),
      request.body ?? {},
      'The sync run',
    );
    response.json(await runOneRosterSync(database, services.config, flags));
  });
  router.get('/backup', (_request, response) => answerBackup(services, response));
  router.post('/years/start', async (request, response) => {
    const { dryRun, ...rest } = parseInput(
      yearStartInputSchema.and(z.object({ dryRun: z.boolean().default(false) })),
      request.body,
      'The new year',
    );
    response.json(await startSchoolYear(db, null, rest, { commit: !dryRun }));
  });
  return router;
}
