import { Router } from 'express';
import {
  passOffBatchSchema,
  passOffInputSchema,
  passOffPatchSchema,
  recordingSizeLimit,
} from '@shared/api/pass-off';
import { recordingUpload } from '../core/upload';
import { actorOf, requires, requiresAny } from '../core/policy';
import { parseId, parseInput } from '../core/validate';
import type { Services } from '../services';
import { deletePassOff, getPassOff, listPassOffs, updatePassOff } from './pass-offs-service';
import { recordPassOffs } from './record-pass-offs';
import { attachRecording, openRecording } from './recordings-service';
import { recordingExtensions } from './recording-type';

/** The recording a pass-off keeps: one file of at most 10 MB. */
const receiveRecording = recordingUpload(
  { fileSize: recordingSizeLimit, files: 1, fields: 5 },
  'A recording may be at most 10 MB.',
);

/** `/api/pass-offs`: directors record for their schools; viewers read; students read their own. */
export function passOffsRoutes({ db, config }: Services): Router {
  const router = Router();
  const readers = requiresAny('pass-offs:read', 'self:read');
  router.get('/pass-offs', readers, async (request, response) => {
    response.json(await listPassOffs(db, actorOf(request), request.query));
  });
  router.get('/pass-offs/:id', readers, async (request, response) => {
    response.json(await getPassOff(db, actorOf(request), parseId(request.params['id'])));
  });
  router.post('/pass-offs', requires('pass-offs:write'), async (request, response) => {
    const body = request.body as unknown;
    if (body && typeof body === 'object' && 'passOffs' in body) {
      const batch = parseInput(passOffBatchSchema, body, 'The pass-offs');
      const result = await recordPassOffs(db, actorOf(request), batch.passOffs);
      response.status(result.created > 0 ? 201 : 200).json(result);
      return;
    }
    const input = parseInput(passOffInputSchema, body, 'The pass-off');
    const result = await recordPassOffs(db, actorOf(request), [input]);
    response.status(result.created > 0 ? 201 : 200).json(result.rows[0]);
  });
  router.patch('/pass-offs/:id', requires('pass-offs:write'), async (request, response) => {
    const id = parseId(request.params['id']);
    const patch = parseInput(passOffPatchSchema, request.body, 'The change');
    response.json(await updatePassOff(db, actorOf(request), id, patch));
  });
  router.delete('/pass-offs/:id', requires('pass-offs:write'), async (request, response) => {
    await deletePassOff(db, actorOf(request), parseId(request.params['id']), config.dataDir);
    response.status(204).end();
  });
  router.post(
    '/pass-offs/:id/recording',
    requires('pass-offs:write'),
    receiveRecording,
    async (request, response) => {
      const id = parseId(request.params['id']);
      response
        .status(201)
        .json(await attachRecording(db, actorOf(request), config.dataDir, id, request.file));
    },
  );
  router.get('/pass-offs/:id/recording', readers, async (request, response) => {
    const id = parseId(request.params['id']);
    const { file, recording } = await openRecording(db, actorOf(request), config.dataDir, id);
    const extension =
      recordingExtensions[recording.contentType as keyof typeof recordingExtensions];
    response.set('Content-Type', recording.contentType);
    response.set('Content-Disposition', `inline; filename="pass-off-${id}.${extension}"`);
    response.set('Cache-Control', 'private, no-store');
    response.sendFile(file);
  });
  return router;
}
