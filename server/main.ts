import { createHttpServer } from './core/http-server';
import type { AddressInfo } from 'node:net';
import { fileURLToPath } from 'node:url';
import { loadConfig, type Config } from './config';
import { migrateDatabase, openDatabase, type DatabaseHandle } from './db/client';
import { refreshStatistics, statisticsStale } from './db/statistics';
import { settleUnfinishedImports } from './imports/landed-students';
import { randomBytes } from 'node:crypto';
import { acquireLock, updateLock } from './db/data-lock';
import { createLogger, type Logger } from './logger';

/** A listening Tuttiboard server. */
export interface RunningServer {
  url: string;
  port: number;
  database: DatabaseHandle;
  close(): Promise<void>;
}

/** Opens (and locks) the database for a server: PGlite in the data folder, or DATABASE_URL. */
export async function openServerDatabase(config: Config, purpose: string, localKey?: string) {
  if (config.databaseUrl) {
    return {
      database: await openDatabase({ kind: 'postgres', url: config.databaseUrl }),
      release: () => {},
    };
  }
  const release = acquireLock(config.dataDir, purpose, config.appUrl, localKey);
  try {
    return { database: await openDatabase({ kind: 'pglite', dataDir: config.dataDir }), release };
  } catch (error) {
    release();
    throw error;
  }
}

/**
 * Migrates, then listens. `prepare` runs after migration and before the first request (the
 * start script seeds the demo district there).
 */
export async function startServer(
  config: Config,
  options: {
    logger?: Logger;
    host?: string;
    prepare?: (database: DatabaseHandle) => Promise<void>;
  } = {},
): Promise<RunningServer> {
  const logger = options.logger ?? createLogger(config.logLevel);
  const localKey = config.databaseUrl ? undefined : randomBytes(24).toString('base64url');
  // The routes (and the packages behind them) load while the database opens: start-up is
  // the longer of the two, not their sum.
  const appModule = import('./app');
  const { database, release } = await openServerDatabase(config, 'the Tuttiboard server', localKey);
  try {
    await migrateDatabase(database);
    const takenBack = await settleUnfinishedImports(database);
    if (takenBack > 0)
      logger.warn(
        { students: takenBack },
        'Took back the students of a roster import that did not finish before the last stop.',
      );
    await options.prepare?.(database);
    // Once, for a data folder never analyzed (filled before imports and seeds gathered statistics).
    if (await statisticsStale(database.db, 'students', 0)) await refreshStatistics(database.db);
    if (config.trustProxy && config.appUrlIsFixed && config.appUrl.startsWith('http:')) {
      logger.warn(
        { appUrl: config.appUrl },
        'TRUST_PROXY is on but APP_URL is http: if the proxy serves HTTPS, set APP_URL to the https address.',
      );
    }
    const { createApp } = await appModule;
    const app = await createApp(config, { database, logger, localKey });
    const server = createHttpServer(app);
    await new Promise<void>((resolve, reject) => {
      server.once('error', reject);
      server.listen(config.port, options.host, () => resolve());
    });
    const port = (server.address() as AddressInfo).port;
    if (!config.databaseUrl) {
      updateLock(config.dataDir, { url: `http://127.0.0.1:${port}` });
    }
    let closing: Promise<void> | undefined;
    return {
      url: config.appUrlIsFixed ? config.appUrl : `http://localhost:${port}`,
      port,
      database,
      close: () =>
        (closing ??= (async () => {
          await new Promise<void>((resolve) => {
            server.close(() => resolve());
            server.closeIdleConnections();
            setTimeout(() => server.closeAllConnections(), 2000).unref();
          });
          await (app.locals['stop'] as () => Promise<void>)();
          await database.close();
          release();
        })()),
    };
  } catch (error) {
    await database.close();
    release();
    throw error;
  }
}

/** Stops cleanly on Ctrl-C or a service manager's TERM, closing the database first. */
export function closeOnSignals(close: () => Promise<void>, logger: Logger) {
  let stopping = false;
  const stop = (signal: string) => {
    if (stopping) return;
    stopping = true;
    logger.info({ signal }, 'stopping');
    close()
      .then(() => process.exit(0))
      .catch((error: unknown) => {
        logger.error({ err: error }, 'error while stopping');
        process.exit(1);
      });
  };
  process.on('SIGINT', () => stop('SIGINT'));
  process.on('SIGTERM', () => stop('SIGTERM'));
}

/** Starts the server from the environment's configuration, as `npm run serve` does. */
export async function serveFromEnvironment(): Promise<void> {
  const config = loadConfig();
  const logger = createLogger(config.logLevel);
  try {
    const server = await startServer(config, { logger });
    logger.info({ url: server.url }, 'Tuttiboard is listening');
    closeOnSignals(server.close, logger);
  } catch (error) {
    process.stderr.write(
      `Tuttiboard could not start: ${error instanceof Error ? error.message : String(error)}\n`,
    );
    process.exit(1);
  }
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1])
  await serveFromEnvironment();
