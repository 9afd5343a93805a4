import { idParameter } from '@shared/api/input-rules';
import express, { Router, type NextFunction, type Request, type Response } from 'express';
import { fileNamePrefix } from '../reports/report-render';
import { districtIdentity } from '../district/district-queries';
import multer from 'multer';
import { z } from 'zod';
import {
  cleanedInputSchema,
  instrumentInputSchema,
  instrumentPatchSchema,
} from '@shared/api/instrument';
import { actorOf, requires } from '../core/policy';
import { HttpError, badRequest } from '../core/errors';
import { parseId, parseInput } from '../core/validate';
import type { Services } from '../services';
import { listInstruments } from './instruments-queries';
import { instrumentDetail } from './instrument-detail';
import { createInstrument, markCleaned, updateInstrument } from './instruments-service';
import { addPhoto, photoSizeLimit, readPhoto } from './instrument-photos';
import { assetLabelsPdf } from './asset-labels';
import { importFleet } from './fleet-import';

const photoUpload = multer({
  storage: multer.memoryStorage(),
  limits: { fileSize: photoSizeLimit, files: 1 },
}).single('photo');

/** Multer's errors as the API's own: too large is 413, anything else about the form 400. */
function receivePhoto(request: Request, response: Response, next: NextFunction) {
  photoUpload(request, response, (error: unknown) => {
    if (!error) return next();
    if (error instanceof multer.MulterError) {
      return next(
        error.code === 'LIMIT_FILE_SIZE'
          ? new HttpError(413, 'too_large', 'A photo may be at most 5 MB.')
          : new HttpError(
              400,
              'bad_request',
              `The upload was refused: ${error.message}. Send one file in the field "photo".`,
            ),
      );
    }
    next(error);
  });
}

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

/** `/api/instruments`: the fleet, its photos, labels, cleaning and CSV import. */
export function instrumentsRoutes({ db, config }: Services): Router {
  const router = Router();
  router.get('/instruments', requires('fleet:read'), async (request, response) => {
    response.json(await listInstruments(db, actorOf(request), request.query));
  });
  router.get('/instruments/labels.pdf', requires('fleet:read'), async (request, response) => {
    const { schoolId, instrumentId, skip } = parseInput(
      labelQuerySchema,
      request.query,
      'The label query',
    );
    const pdf = await assetLabelsPdf(
      db,
      actorOf(request),
      schoolId,
      instrumentId === undefined ? undefined : { instrumentId, skip },
    );
    response
      .type('application/pdf')
      .set(
        'Content-Disposition',
        `inline; filename="${fileNamePrefix((await districtIdentity(db))?.shortName)}asset-labels.pdf"`,
      )
      .send(pdf);
  });
  router.post(
    '/instruments/import',
    requires('fleet:write'),
    express.raw({ type: () => true, limit: '10mb' }),
    async (request, response) => {
      const { dryRun } = parseInput(importQuerySchema, request.query, 'The import query');
      if (request.body !== undefined && !Buffer.isBuffer(request.body)) {
        throw badRequest(
          'Send the fleet CSV file itself as the request body (Content-Type: text/csv).',
        );
      }
      const bytes = Buffer.isBuffer(request.body) ? request.body : Buffer.alloc(0);
      const result = await importFleet(db, actorOf(request), bytes, dryRun === 'true');
      response.json(result);
    },
  );
  router.get('/instruments/:id', requires('fleet:read'), async (request, response) => {
    response.json(await instrumentDetail(db, actorOf(request), parseId(request.params['id'])));
  });
  router.post('/instruments', requires('fleet:write'), async (request, response) => {
    const input = parseInput(instrumentInputSchema, request.body, 'The instrument');
    response.status(201).json(await createInstrument(db, actorOf(request), input));
  });
  router.patch('/instruments/:id', requires('fleet:write'), async (request, response) => {
    const id = parseId(request.params['id']);
    const patch = parseInput(instrumentPatchSchema, request.body, 'The change');
    response.json(await updateInstrument(db, actorOf(request), id, patch));
  });
  router.post('/instruments/:id/cleaned', requires('fleet:write'), async (request, response) => {
    const id = parseId(request.params['id']);
    const { note } = parseInput(cleanedInputSchema, request.body ?? {}, 'The cleaning record');
    response.json(await markCleaned(db, actorOf(request), id, note));
  });
  router.post(
    '/instruments/:id/photos',
    requires('fleet:write'),
    receivePhoto,
    async (request, response) => {
      const id = parseId(request.params['id']);
      const bytes = request.file?.buffer ?? Buffer.alloc(0);
      response.status(201).json(await addPhoto(db, config.dataDir, actorOf(request), id, bytes));
    },
  );
  router.get(
    '/instruments/:id/photos/:photoId',
    requires('fleet:read'),
    async (request, response) => {
      const photo = await readPhoto(
        db,
        config.dataDir,
        actorOf(request),
        parseId(request.params['id']),
        parseId(request.params['photoId']),
      );
      response
        .set('Cache-Control', 'private, max-age=3600')
        .type(photo.contentType)
        .send(photo.bytes);
    },
  );
  return router;
}
