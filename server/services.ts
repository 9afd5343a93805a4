import type { Config } from './config';
import type { Database, DatabaseHandle } from './db/client';
import type { Logger } from './logger';

/** What every feature's routes are built from. */
export interface Services {
  config: Config;
  db: Database;
  database: DatabaseHandle;
  logger: Logger;
}
