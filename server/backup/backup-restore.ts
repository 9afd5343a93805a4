import fs from 'node:fs';
import { readdir, rename, rm } from 'node:fs/promises';
import path from 'node:path';
import { PGlite } from '@electric-sql/pglite';
import { migrateDatabase, openDatabase } from '../db/client';
import {
  databaseName,
  extractBackup,
  filesFolder,
  workingFolder,
  type BackupManifest,
} from './backup-archive';

/** The database inside a backup that checked out could not be opened; nothing was changed. */
export class RestoredDatabaseError extends Error {}

/** What a restore replaces in a data folder: everything but the lock and working folders. */
function replacedByRestore(name: string): boolean {
  return name !== 'tutti.lock' && !name.startsWith('.');
}

/**
 * Restores a backup into a data folder whose lock the caller holds: all of it or nothing.
 *
 * 1. The archive is read into a working folder and checked against its manifest (throws
 *    BackupArchiveError: nothing was touched).
 * 2. The database is opened from it there and migrated to this version's schema, beside the
 *    files (throws RestoredDatabaseError: nothing was touched).
 * 3. Only then are the data folder's database and files moved aside and the restored ones moved
 *    in, each a rename on one file system; should one fail, those already moved go back.
 */
export async function restoreBackup(dataDir: string, file: string): Promise<BackupManifest> {
  const working = await workingFolder(dataDir, 'restore');
  try {
    const archive = path.join(working, 'archive');
    const manifest = await extractBackup(file, archive);
    const restored = path.join(working, 'data');
    fs.mkdirSync(restored);
    try {
      const image = fs.readFileSync(path.join(archive, databaseName));
      const engine = await PGlite.create({
        dataDir: path.join(restored, 'pg'),
        loadDataDir: new Blob([new Uint8Array(image)]),
      });
      await engine.close();
      const handle = await openDatabase({ kind: 'pglite', dataDir: restored });
      try {
        await migrateDatabase(handle);
      } finally {
        await handle.close();
      }
    } catch (error) {
      throw new RestoredDatabaseError(
        `the database in it could not be opened (${error instanceof Error ? error.message.split('\n')[0] : error})`,
      );
    }
    const files = path.join(archive, filesFolder);
    if (fs.existsSync(files))
      for (const name of await readdir(files))
        await rename(path.join(files, name), path.join(restored, name));
    await swapIn(dataDir, restored, path.join(working, 'before'));
    return manifest;
  } finally {
    await rm(working, { recursive: true, force: true });
  }
}

async function swapIn(dataDir: string, restored: string, aside: string): Promise<void> {
  fs.mkdirSync(aside);
  const current = (await readdir(dataDir)).filter(replacedByRestore);
  const movedAside: string[] = [];
  const movedIn: string[] = [];
  try {
    for (const name of current) {
      await rename(path.join(dataDir, name), path.join(aside, name));
      movedAside.push(name);
    }
    for (const name of await readdir(restored)) {
      await rename(path.join(restored, name), path.join(dataDir, name));
      movedIn.push(name);
    }
  } catch (error) {
    for (const name of movedIn) await rename(path.join(dataDir, name), path.join(restored, name));
    for (const name of movedAside) await rename(path.join(aside, name), path.join(dataDir, name));
    throw error;
  }
}
