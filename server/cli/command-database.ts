import type { Config } from '../config';
import { migrateDatabase, type DatabaseHandle } from '../db/client';
import { settleUnfinishedImports } from '../imports/landed-students';
import { openServerDatabase } from '../main';

/**
 * Opens the database for one command, migrated, and closes it after. In PGlite mode this takes
 * the data folder's lock, so a command refuses while a server holds the folder.
 */
export async function withCommandDatabase<Result>(
  config: Config,
  purpose: string,
  work: (database: DatabaseHandle) => Promise<Result>,
): Promise<Result> {
  const { database, release } = await openServerDatabase(config, purpose);
  try {
    await migrateDatabase(database);
    await settleUnfinishedImports(database);
    return await work(database);
  } finally {
    await database.close();
    release();
  }
}
