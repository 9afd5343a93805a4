import fs from 'node:fs';
import path from 'node:path';
import { PGlite } from '@electric-sql/pglite';
import type { Config } from '../config';
import { acquireLock } from '../db/data-lock';
import { migrateDatabase, openDatabase } from '../db/client';
import { CommandError } from './command-error';
import { withCommandDatabase } from './command-database';

function refuseServerMode(config: Config) {
  if (config.databaseUrl) {
    throw new CommandError(
      'DATABASE_URL is set: back up a PostgreSQL server with its own tools, e.g. ' +
        "pg_dump --format=custom --file=tutti.dump \"$DATABASE_URL\" and pg_restore --clean --dbname=\"$DATABASE_URL\" tutti.dump.",
      1,
    );
  }
}

/** `tutti backup <file>`: writes the embedded database to one compressed file. */
export async function backupCommand(config: Config, args: string[]): Promise<number> {
  if (args.length !== 1) throw new CommandError('Give the file to write the backup to.');
  refuseServerMode(config);
  const file = path.resolve(args[0]!);
  await withCommandDatabase(config, `tutti backup ${file}`, async ({ pglite }) => {
    const image = await pglite!.dumpDataDir('gzip');
    const temporary = `${file}.partial`;
    fs.writeFileSync(temporary, Buffer.from(await image.arrayBuffer()));
    fs.renameSync(temporary, file);
  });
  process.stdout.write(`Backed up the database in ${config.dataDir} to ${file} (${fs.statSync(file).size} bytes).\n`);
  return 0;
}

/**
 * `tutti restore <file>`: replaces the embedded database with a backup. The old database is
 * kept beside it until the restored one has opened and migrated.
 */
export async function restoreCommand(config: Config, args: string[]): Promise<number> {
  if (args.length !== 1) throw new CommandError('Give the backup file to restore.');
  refuseServerMode(config);
  const file = path.resolve(args[0]!);
  let bytes: Buffer;
  try {
    bytes = fs.readFileSync(file);
  } catch {
    throw new CommandError(`Cannot read the backup file ${file}.`);
  }
  const release = acquireLock(config.dataDir, `tutti restore ${file}`);
  const folder = path.join(config.dataDir, 'pg');
  const aside = `${folder}.before-restore-${Date.now()}`;
  try {
    if (fs.existsSync(folder)) fs.renameSync(folder, aside);
    try {
      const restored = await PGlite.create({ dataDir: folder, loadDataDir: new Blob([new Uint8Array(bytes)]) });
      await restored.close();
      const handle = await openDatabase({ kind: 'pglite', dataDir: config.dataDir });
      try {
        await migrateDatabase(handle);
      } finally {
        await handle.close();
      }
    } catch (error) {
      fs.rmSync(folder, { recursive: true, force: true });
      if (fs.existsSync(aside)) fs.renameSync(aside, folder);
      throw new CommandError(
        `${file} is not a Tuttiboard backup that can be restored (${error instanceof Error ? error.message : error}). The database was left as it was.`,
        1,
      );
    }
    fs.rmSync(aside, { recursive: true, force: true });
  } finally {
    release();
  }
  process.stdout.write(`Restored ${file} into ${config.dataDir}.\n`);
  return 0;
}
