import { idParameter } from '@shared/api/input-rules';
import express, { Router, type RequestHandler } from 'express';
import { fileNamePrefix } from '../reports/report-render';
import { districtIdentity } from '../district/district-queries';
import { z } from 'zod';
import {
  cleanedInputSchema,
  instrumentInputSchema,
  instrumentPatchSchema,
} from '@shared/api/instrument';
import { actorOf, requires } from '../core/policy';
import { HttpError, badRequest } from '../core/errors';
import { parseInput } from '../core/validate';
import { singleUpload } from '../core/upload';
import { answer, created, idOf, recordRoutes, type RouteWork } from '../core/routes';
import type { Database } from '../db/client';
import type { Services } from '../services';
import { listInstruments } from './instruments-queries';
import { instrumentDetail } from './instrument-detail';
import { createInstrument, markCleaned, updateInstrument } from './instruments-service';
import { addPhoto, photoSizeLimit, readPhoto } from './instrument-photos';
import { assetLabelsPdf } from './asset-labels';
import { importFleet } from './fleet-import';

/** One photo of at most 5 MB in the field "photo": too large is 413, anything else about the form 400. */
const receivePhoto = singleUpload('photo', { fileSize: photoSizeLimit, files: 1 }, (error) =>
  error.code === 'LIMIT_FILE_SIZE'
    ? new HttpError(413, 'too_large', 'A photo may be at most 5 MB.')
    : new HttpError(
        400,
        'bad_request',
        `The upload was refused: ${error.message}. Send one file in the field "photo".`,
      ),
);

/** Labels per sheet: 3 across, 10 down (a common US Letter label sheet, from memory). */
const labelsPerSheet = 30;
const labelQuerySchema = z.object({
  schoolId: idParameter.optional(),
  /** One instrument's label only. */
  instrumentId: idParameter.optional(),
  /** How many labels of the sheet are used already: the label prints in the next free place. */
  skip: z.coerce
    .number()
    .int()
    .min(0)
    .max(
      labelsPerSheet - 1,
      `A sheet has ${labelsPerSheet} labels; skip at most ${labelsPerSheet - 1}.`,
    )
    .default(0),
});
const importQuerySchema = z.object({ dryRun: z.enum(['true', 'false']).default('true') });

/** `GET /instruments/labels.pdf`: a sheet of asset-tag labels, or one label in its place. */
function labelsRoute(db: Database): RequestHandler {
  return async (request, response) => {
    const query = parseInput(labelQuerySchema, request.query, 'The label query');
    const { schoolId, instrumentId, skip } = query;
    const one = instrumentId === undefined ? undefined : { instrumentId, skip };
    const pdf = await assetLabelsPdf(db, actorOf(request), schoolId, one);
    const prefix = fileNamePrefix((await districtIdentity(db))?.shortName);
    response
      .type('application/pdf')
      .set('Content-Disposition', `inline; filename="${prefix}asset-labels.pdf"`)
      .send(pdf);
  };
}

/** `POST /instruments/import`: the fleet CSV as the body; a dry run unless `dryRun=false`. */
function importRoute(db: Database): RouteWork {
  return async (request, actor) => {
    const { dryRun } = parseInput(importQuerySchema, request.query, 'The import query');
    if (request.body !== undefined && !Buffer.isBuffer(request.body)) {
      throw badRequest(
        'Send the fleet CSV file itself as the request body (Content-Type: text/csv).',
      );
    }
    const bytes = Buffer.isBuffer(request.body) ? request.body : Buffer.alloc(0);
    return importFleet(db, actor, bytes, dryRun === 'true');
  };
}

/** `GET /instruments/:id/photos/:photoId`: the photo's bytes, kept an hour by the browser. */
function photoRoute(db: Database, dataDir: string): RequestHandler {
  return async (request, response) => {
    const ids = [idOf(request), idOf(request, 'photoId')] as const;
    const photo = await readPhoto(db, dataDir, actorOf(request), ...ids);
    response
      .set('Cache-Control', 'private, max-age=3600')
      .type(photo.contentType)
      .send(photo.bytes);
  };
}

/** One instrument: its detail, adding one, and changing it. */
const records = recordRoutes('/instruments', {
  read: ['fleet:read', undefined, instrumentDetail],
  create: ['fleet:write', instrumentInputSchema, 'The instrument', createInstrument],
  update: ['fleet:write', instrumentPatchSchema, updateInstrument],
});

/** `/api/instruments`: the fleet, its photos, labels, cleaning and CSV import. */
export function instrumentsRoutes(services: Services): Router {
  const { db, config } = services;
  const router = Router();
  const reads = requires('fleet:read');
  const writes = requires('fleet:write');
  router.get(
    '/instruments',
    reads,
    answer((request, actor) => listInstruments(db, actor, request.query)),
  );
  router.get('/instruments/labels.pdf', reads, labelsRoute(db));
  const rawBody = express.raw({ type: () => true, limit: '10mb' });
  router.post('/instruments/import', writes, rawBody, answer(importRoute(db)));
  records(services, router);
  router.post(
    '/instruments/:id/cleaned',
    writes,
    answer((request, actor) => {
      const id = idOf(request);
      const { note } = parseInput(cleanedInputSchema, request.body ?? {}, 'The cleaning record');
      return markCleaned(db, actor, id, note);
    }),
  );
  router.post(
    '/instruments/:id/photos',
    writes,
    receivePhoto,
    created((request, actor) => {
      const bytes = request.file?.buffer ?? Buffer.alloc(0);
      return addPhoto(db, config.dataDir, actor, idOf(request), bytes);
    }),
  );
  router.get('/instruments/:id/photos/:photoId', reads, photoRoute(db, config.dataDir));
  return router;
}
