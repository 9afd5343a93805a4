import { Router, type Request, type Response } from 'express';
import type { Services } from '../services';
import { actorOf, requires } from '../core/policy';
import { HttpError } from '../core/errors';
import { recordAudit } from '../core/audit';
import { nothing, parseInput } from '../core/validate';
import { describeBackup, writeBackup } from './backup-archive';

/** What a PostgreSQL server's operator uses instead: its own tools, and the files folder. */
export function serverModeBackupAdvice(dataDir: string): string {
  return (
    'This Tuttiboard runs on a PostgreSQL server (DATABASE_URL): back up its database with ' +
    'pg_dump --format=custom --file=tutti.dump "$DATABASE_URL" (restore with pg_restore --clean ' +
    `--dbname="$DATABASE_URL" tutti.dump), and copy the files folder ${dataDir} ` +
    '(photos, recordings, imports) beside it.'
  );
}

/** The name a downloaded backup is saved under. */
export function backupFileName(now = new Date()): string {
  return `tuttiboard-backup-${now.toISOString().slice(0, 19).replace(/[T:]/g, '-')}.tar.gz`;
}

/**
 * Answers a backup archive of the running embedded database and its files (see
 * server/backup/backup-archive.ts). The headers carry what it holds, for `tutti backup`.
 */
export async function answerBackup(
  { database, config, logger }: Services,
  response: Response,
): Promise<void> {
  if (!database.pglite)
    throw new HttpError(409, 'server_mode', serverModeBackupAdvice(config.dataDir));
  try {
    const { manifest, snapshotMs } = await writeBackup(
      database.pglite,
      config.dataDir,
      (manifest, heldMs) => {
        response
          .status(200)
          .type('application/gzip')
          .set('Content-Disposition', `attachment; filename="${backupFileName()}"`)
          .set('X-Tutti-Backup-Files', String(manifest.files.count))
          .set('X-Tutti-Backup-File-Bytes', String(manifest.files.bytes))
          .set('X-Tutti-Backup-Database-Bytes', String(manifest.database.bytes))
          .set('X-Tutti-Backup-Held-Ms', String(Math.round(heldMs)));
        return response;
      },
    );
    logger.info(
      { files: manifest.files.count, heldMs: Math.round(snapshotMs) },
      `Backed up ${describeBackup(manifest)}`,
    );
  } catch (error) {
    // Once the archive has begun, the answer cannot turn into an error: cut it short, so the
    // receiver sees an incomplete download rather than a file that looks whole.
    if (!response.headersSent) throw error;
    logger.error({ err: error }, 'A backup failed while it was being sent');
    response.destroy();
  }
}

/** `GET /api/backup`: the coordinator downloads a backup of the whole district. */
export function backupRoutes(services: Services): Router {
  const router = Router();
  router.get(
    '/backup',
    requires('district:backup'),
    async (request: Request, response: Response) => {
      parseInput(nothing, request.query, 'The query');
      if (services.database.pglite)
        await recordAudit(services.db, actorOf(request), {
          action: 'download',
          entity: 'backup',
          entityId: backupFileName(),
        });
      await answerBackup(services, response);
    },
  );
  return router;
}
