import { Router } from 'express';
import { badRequest } from '../core/errors';
import { requires } from '../core/policy';
import type { Services } from '../services';

/**
 * `GET /api/backup` (coordinator): the embedded database as one compressed file, the same file
 * `tutti backup` writes and `tutti restore` reads, for a backup taken from the browser before a
 * change as large as a new school year. A PostgreSQL server is backed up with its own tools.
 */
export function backupRoutes({ database }: Services): Router {
  const router = Router();
  router.get('/backup', requires('backup:download'), async (_request, response) => {
    if (!database.pglite) {
      throw badRequest(
        'This district runs on a PostgreSQL server: back it up with its own tools (pg_dump).',
      );
    }
    const image = await database.pglite.dumpDataDir('gzip');
    const day = new Date().toISOString().slice(0, 10);
    response
      .type('application/gzip')
      .attachment(`tuttiboard-backup-${day}.tar.gz`)
      .send(Buffer.from(await image.arrayBuffer()));
  });
  return router;
}
