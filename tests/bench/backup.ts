import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { benchDistrict, gridPages, serveForBench } from './grid-pages';
import { figure, percentile, type BenchFigure } from './bench-figure';
import { httpClients } from './http-clients';

/**
 * 20 simultaneous clients on grid pages while a coordinator downloads a backup
 * (`GET /api/backup`, the path `tutti backup` takes through a running server), against the same
 * clients without it. The snapshot holds the engine while it dumps the database and links the
 * files (server/backup/backup-archive.ts), so every page asked for then waits for it; the
 * archive is hashed and compressed after, while pages go on. No target yet: the figure says how
 * long pages wait.
 */
export async function benchBackup(options: {
  students: number;
  photos: number;
}): Promise<BenchFigure[]> {
  const district = await benchDistrict(options.students);
  const dataDir = fs.mkdtempSync(path.join(os.tmpdir(), 'tutti-bench-backup-'));
  // Files beside the database, as photos would be: 200 KB each.
  fs.mkdirSync(path.join(dataDir, 'photos'));
  for (let photo = 0; photo < options.photos; photo += 1)
    fs.writeFileSync(path.join(dataDir, 'photos', `${photo}.jpg`), Buffer.alloc(200_000, photo));
  const server = await serveForBench(district.database, dataDir);
  const clients = httpClients(server.url, server.token);
  try {
    const paths = gridPages(district.schoolIds[0]!, options.students).map((page) => page.path);
    for (const path of paths) await clients.sequential(path, 2);
    const quietClients = clients.start(paths, 20);
    await new Promise((resolve) => setTimeout(resolve, 3_000));
    const quiet = await quietClients.stop();

    // The download goes through a client on a worker thread of its own, as a coordinator's
    // browser would be: read in this process, the 16 MB body would wait for the server's busy
    // event loop a chunk at a time. How long the snapshot held the engine is timed around
    // PGlite's exclusive section, which only the snapshot takes.
    const engine = district.database.pglite!;
    const exclusive = engine.runExclusive.bind(engine);
    let heldMs = 0;
    engine.runExclusive = async <T>(work: () => Promise<T>) =>
      exclusive(async () => {
        const started = performance.now();
        try {
          return await work();
        } finally {
          heldMs = Math.max(heldMs, performance.now() - started);
        }
      });
    const downloader = httpClients(server.url, server.token);
    const busyClients = clients.start(paths, 20);
    await new Promise((resolve) => setTimeout(resolve, 50));
    const [backupMs] = await downloader
      .sequential('/api/backup', 1)
      .finally(() => downloader.close());
    const busy = await busyClients.stop();
    const longest = Math.max(...busy);
    return [
      figure(
        `grid p95 with 20 clients during a backup of ${options.students.toLocaleString('en-US')} students and ${options.photos} files (${Math.round(backupMs!)} ms)`,
        percentile(busy, 95),
        percentile(quiet, 95),
        `no target; engine held ${Math.round(heldMs)} ms for the snapshot; ${busy.length} pages during (longest ${Math.round(longest)} ms), ${quiet.length} in 3 s without`,
      ),
      figure(
        "longest page wait during the backup, against the snapshot's hold of the engine",
        longest,
        heldMs,
        'a page asked for during the snapshot waits for it, and then for the pages queued before it',
      ),
    ];
  } finally {
    await clients.close();
    await server.close();
    await district.database.close();
    fs.rmSync(dataDir, { recursive: true, force: true });
  }
}
