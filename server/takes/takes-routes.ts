import { Router } from 'express';
import { z } from 'zod';
import {
  heardTakeInputSchema,
  takeInputSchema,
  takeRetentionSchema,
  takeSizeLimit,
} from '@shared/api/take';
import { recordingUpload } from '../core/upload';
import { actorOf, requires, requiresAny } from '../core/policy';
import { nothing, parseId, parseInput } from '../core/validate';
import { recordingExtensions } from '../pass-offs/recording-type';
import type { Services } from '../services';
import {
  keepHeardTake,
  keepTake,
  listTakes,
  openTake,
  sendTake,
  setTakeRetention,
  takeRetention,
} from './takes-service';

/** A take: one file of at most 10 MB, with its fields. */
const receiveTake = recordingUpload(
  { fileSize: takeSizeLimit, files: 1, fields: 5, fieldSize: 256 * 1024 },
  'A take may be at most 10 MB.',
);

const listQuerySchema = z.object({ studentId: z.coerce.number().int().positive().optional() });

/**
 * `/api/takes`: a student keeps takes of their requirements and sends them to their directors;
 * directors of the student's school and the coordinator hear the sent ones. The district's
 * retention lives at `/api/settings/take-retention` (coordinator).
 */
export function takesRoutes({ db, config }: Services): Router {
  const router = Router();
  const hearers = requiresAny('takes:own', 'takes:hear');
  router.get('/takes', hearers, async (request, response) => {
    const query = parseInput(listQuerySchema, request.query, 'The query');
    response.json(await listTakes(db, actorOf(request), query));
  });
  router.post('/takes', requires('takes:own'), receiveTake, async (request, response) => {
    const input = parseInput(takeInputSchema, request.body, 'The take');
    response
      .status(201)
      .json(await keepTake(db, actorOf(request), config.dataDir, input, request.file));
  });
  // A director's own take of a student, kept as evidence of the pass-off.
  router.post(
    '/takes/heard',
    requires('pass-offs:write'),
    receiveTake,
    async (request, response) => {
      const input = parseInput(heardTakeInputSchema, request.body, 'The take');
      response
        .status(201)
        .json(await keepHeardTake(db, actorOf(request), config.dataDir, input, request.file));
    },
  );
  router.post('/takes/:id/send', requires('takes:own'), async (request, response) => {
    response.json(await sendTake(db, actorOf(request), parseId(request.params['id'])));
  });
  router.get('/takes/:id/recording', hearers, async (request, response) => {
    const id = parseId(request.params['id']);
    const { file, take } = await openTake(db, actorOf(request), config.dataDir, id);
    const extension = recordingExtensions[take.contentType as keyof typeof recordingExtensions];
    response.set('Content-Type', take.contentType);
    response.set('Content-Disposition', `inline; filename="take-${id}.${extension}"`);
    response.set('Cache-Control', 'private, no-store');
    response.sendFile(file);
  });
  router.get('/settings/take-retention', requires('takes:retention'), async (request, response) => {
    parseInput(nothing, request.query, 'The query');
    response.json(await takeRetention(db));
  });
  router.put('/settings/take-retention', requires('takes:retention'), async (request, response) => {
    const retention = parseInput(takeRetentionSchema, request.body, 'The retention');
    response.json(await setTakeRetention(db, actorOf(request), retention));
  });
  return router;
}
