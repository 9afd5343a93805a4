import { Router, type Request, type RequestHandler } from 'express';
import multer from 'multer';
import path from 'node:path';
import {
  commitRequestSchema,
  importPresetInputSchema,
  largestRosterUpload,
  previewFieldsSchema,
} from '@shared/api/import';
import { HttpError, badRequest } from '../core/errors';
import { requires, type Actor } from '../core/policy';
import { answer, created, idOf, noContent, type RouteWork } from '../core/routes';
import { nothing, parseInput } from '../core/validate';
import type { DatabaseHandle } from '../db/client';
import type { Services } from '../services';
import { getImport, importErrorsCsv, listImports } from './import-history';
import { importPreview } from './import-preview';
import { deletePreset, listPresets, savePreset } from './import-presets';
import { importRoster, planUpload } from './imports-service';
import { previewImportUndo, undoImport } from './import-undo';
import { UploadStore } from './upload-store';

const expired = () =>
  new HttpError(
    410,
    'expired',
    'This upload is no longer kept (uploads wait 30 minutes for their commit); upload the file again.',
  );

const megabytes = largestRosterUpload / (1024 * 1024);

/** multer, with its refusals (too large, wrong field, broken multipart) answered as 4xx. */
function rosterUpload(): RequestHandler {
  const single = multer({
    storage: multer.memoryStorage(),
    limits: { fileSize: largestRosterUpload, files: 1, fields: 10, fieldSize: 100_000 },
  }).single('file');
  return (request, response, next) => {
    single(request, response, (error: unknown) => {
      if (!error) return next();
      if (error instanceof multer.MulterError && error.code === 'LIMIT_FILE_SIZE') {
        return next(
          new HttpError(
            413,
            'too_large',
            `The file is larger than ${megabytes} MB; a roster upload can be at most ${megabytes} MB.`,
          ),
        );
      }
      const reason = error instanceof Error ? error.message : String(error);
      next(
        badRequest(
          `The upload could not be read (${reason}); send the roster as the form field 'file'.`,
        ),
      );
    });
  };
}

/** The name an upload is shown under: its base name, cut to a sensible length. */
function cleanFileName(name: string | undefined): string {
  const base = path.basename((name ?? '').replaceAll('\\', '/'));
  // Control characters (C0 and DEL) have no place in a name shown on screen and in the history.
  const printable = [...base].filter((character) => {
    const code = character.charCodeAt(0);
    return code >= 0x20 && code !== 0x7f;
  });
  return printable.join('').slice(0, 200) || 'roster.csv';
}

/** The roster a preview reads: the file just uploaded (kept under a new token), or the one kept under its token. */
async function uploadOf(
  request: Request,
  uploads: UploadStore,
  actor: Actor,
  importToken: string | undefined,
): Promise<{ bytes: Uint8Array; fileName: string; token: string }> {
  if (request.file) {
    const { buffer } = request.file;
    const bytes = new Uint8Array(buffer.buffer, buffer.byteOffset, buffer.byteLength);
    const fileName = cleanFileName(request.file.originalname);
    return {
      bytes,
      fileName,
      token: await uploads.save({ fileName, userId: actor.userId }, bytes),
    };
  }
  if (importToken) {
    // A new mapping for a file already uploaded: read the kept bytes, not a second upload.
    const stored = await uploads.open(importToken, actor.userId);
    if (!stored) throw expired();
    return { bytes: stored.bytes, fileName: stored.fileName, token: importToken };
  }
  throw badRequest("Choose a roster file to upload (the form field 'file').", [
    { field: 'file', message: 'Choose a file.' },
  ]);
}

/** `POST /imports/preview`: what the upload would change, under the token its commit names. */
function previewRoute(uploads: UploadStore, database: DatabaseHandle): RouteWork {
  return async (request, actor) => {
    const fields = parseInput(previewFieldsSchema, request.body ?? {}, 'The upload');
    const { bytes, fileName, token } = await uploadOf(request, uploads, actor, fields.importToken);
    const plan = await planUpload(database, {
      upload: { fileName, bytes },
      mapping: fields.mapping,
      withdrawMissing: fields.withdrawMissing,
      skipInvalid: false,
    });
    if (plan.parsed.refused) {
      // A refused file is not kept for a commit.
      if (request.file) await uploads.remove(token);
      throw badRequest(plan.parsed.refused);
    }
    return importPreview({ token, fileName, bytes }, plan);
  };
}

/** `POST /imports/commit`: lands the kept upload with the mapping the preview showed. */
function commitRoute(uploads: UploadStore, database: DatabaseHandle): RouteWork {
  return async (request, actor) => {
    const input = parseInput(commitRequestSchema, request.body, 'The commit');
    const stored = await uploads.open(input.importToken, actor.userId);
    if (!stored) throw expired();
    const { plan, result } = await importRoster(
      database,
      {
        upload: { fileName: stored.fileName, bytes: stored.bytes },
        mapping: input.mapping,
        withdrawMissing: input.withdrawMissing,
        skipInvalid: input.skipInvalid,
      },
      actor,
      { fileName: stored.fileName, via: actor.via === 'token' ? 'api' : 'wizard' },
    );
    if (plan.parsed.refused) throw badRequest(plan.parsed.refused);
    if (result.committed) await uploads.remove(input.importToken);
    return result;
  };
}

/**
 * `/api/imports`: the coordinator previews a roster upload (kept 30 minutes under a token),
 * commits it, reads the history and its error reports, and keeps named column mappings.
 */
export function importsRoutes({ config, db, database }: Services): Router {
  const router = Router();
  const uploads = new UploadStore(path.join(config.dataDir, 'imports'));
  const runs = requires('imports:run');
  router.post('/imports/preview', runs, rosterUpload(), answer(previewRoute(uploads, database)));
  router.post('/imports/commit', runs, answer(commitRoute(uploads, database)));
  router.get(
    '/imports',
    runs,
    answer((request) => listImports(db, request.query)),
  );
  router.get(
    '/imports/presets',
    runs,
    answer(async (request) => {
      parseInput(nothing, request.query, 'The query');
      return listPresets(db);
    }),
  );
  router.post(
    '/imports/presets',
    runs,
    created((request, actor) =>
      savePreset(db, actor, parseInput(importPresetInputSchema, request.body, 'The preset')),
    ),
  );
  router.delete(
    '/imports/presets/:id',
    runs,
    noContent((request, actor) => deletePreset(db, actor, idOf(request))),
  );
  router.get(
    '/imports/:id',
    runs,
    answer((request) => getImport(db, idOf(request))),
  );
  // Undo: the preview (what it would do, what blocks it), then the undo itself, all or nothing.
  router.get(
    '/imports/:id/undo',
    runs,
    answer(async (request) => {
      parseInput(nothing, request.query, 'The query');
      return previewImportUndo(database, idOf(request));
    }),
  );
  router.post(
    '/imports/:id/undo',
    runs,
    answer(async (request, actor) => {
      const id = idOf(request);
      parseInput(nothing, request.body ?? {}, 'The undo');
      return undoImport(database, id, actor);
    }),
  );
  router.get('/imports/:id/errors.csv', runs, async (request, response) => {
    const { fileName, csv } = await importErrorsCsv(db, idOf(request));
    response.type('text/csv; charset=utf-8');
    response.attachment(fileName);
    response.send(`\uFEFF${csv}`);
  });
  return router;
}
