import fs from 'node:fs';
import path from 'node:path';
import { Readable } from 'node:stream';
import { pipeline } from 'node:stream/promises';
import type { Config } from '../config';
import { acquireLock } from '../db/data-lock';
import { BackupArchiveError, describeBackup, writeBackup } from '../backup/backup-archive';
import { RestoredDatabaseError, restoreBackup } from '../backup/backup-restore';
import { serverModeBackupAdvice } from '../backup/backup-routes';
import { CommandError } from './command-error';
import { withCommandDatabase } from './command-database';
import { localKeyHeader } from './local-command-routes';
import { runningServer } from './running-server';

function refuseServerMode(config: Config) {
  if (config.databaseUrl) throw new CommandError(serverModeBackupAdvice(config.dataDir), 1);
}

/** Asks the running server for a backup and writes it to `partial`; answers what it holds. */
async function backupThroughServer(
  server: { url: string; key: string },
  partial: string,
): Promise<string> {
  let response: Response;
  try {
    response = await fetch(`${server.url}/api/local/backup`, {
      headers: { [localKeyHeader]: server.key },
    });
  } catch (error) {
    throw new CommandError(
      `A Tuttiboard server holds the data folder but did not answer at ${server.url} (${error instanceof Error ? error.message : error}).`,
      1,
    );
  }
  if (response.status !== 200 || !response.body) {
    const answer = (await response.json().catch(() => ({}))) as { error?: { message?: string } };
    throw new CommandError(answer.error?.message ?? `The server answered ${response.status}.`, 1);
  }
  try {
    await pipeline(Readable.fromWeb(response.body as never), fs.createWriteStream(partial));
  } catch (error) {
    throw new CommandError(
      `The server stopped sending the backup (${error instanceof Error ? error.message : error}); nothing was written.`,
      1,
    );
  }
  const header = (name: string) => Number(response.headers.get(`x-tutti-backup-${name}`) ?? 0);
  return describeBackup({
    database: { bytes: header('database-bytes'), sha256: '' },
    files: { count: header('files'), bytes: header('file-bytes'), list: [] },
  });
}

/**
 * `tutti backup <file>`: writes the embedded database and every file the data folder keeps
 * beside it (photos, recordings, uploads) to one .tar.gz with a manifest. While a server holds
 * the data folder, the server takes the snapshot and keeps answering; otherwise the command
 * opens the folder itself.
 */
export async function backupCommand(config: Config, args: string[]): Promise<number> {
  if (args.length !== 1) throw new CommandError('Give the file to write the backup to.');
  refuseServerMode(config);
  const file = path.resolve(args[0]!);
  const partial = `${file}.partial`;
  let holds: string;
  try {
    const server = runningServer(config);
    if (server) holds = await backupThroughServer(server, partial);
    else
      holds = await withCommandDatabase(config, `tutti backup ${file}`, async ({ pglite }) => {
        const { manifest } = await writeBackup(pglite!, config.dataDir, () =>
          fs.createWriteStream(partial),
        );
        return describeBackup(manifest);
      });
    fs.renameSync(partial, file);
  } finally {
    fs.rmSync(partial, { force: true });
  }
  process.stdout.write(
    `Backed up ${holds} from ${config.dataDir} to ${file} (${fs.statSync(file).size.toLocaleString('en-US')} bytes).\n`,
  );
  return 0;
}

/**
 * `tutti restore <file>`: replaces the data folder's database and files with a backup's, after
 * checking the archive against its manifest: all of it or nothing (server/backup/backup-restore.ts).
 * A damaged or incomplete archive is refused with exit code 2 and the folder left as it was.
 */
export async function restoreCommand(config: Config, args: string[]): Promise<number> {
  if (args.length !== 1) throw new CommandError('Give the backup file to restore.');
  refuseServerMode(config);
  const file = path.resolve(args[0]!);
  if (!fs.statSync(file, { throwIfNoEntry: false })?.isFile())
    throw new CommandError(`Cannot read the backup file ${file}.`);
  const release = acquireLock(config.dataDir, `tutti restore ${file}`);
  let holds: string;
  try {
    holds = describeBackup(await restoreBackup(config.dataDir, file));
  } catch (error) {
    if (error instanceof BackupArchiveError)
      throw new CommandError(
        `${file} cannot be restored: ${error.message}. Nothing was changed.`,
        2,
        false,
      );
    if (error instanceof RestoredDatabaseError)
      throw new CommandError(
        `${file} cannot be restored: ${error.message}. Nothing was changed.`,
        1,
      );
    throw error;
  } finally {
    release();
  }
  process.stdout.write(`Restored ${holds} from ${file} into ${config.dataDir}.\n`);
  return 0;
}
