import type { Config } from '../config';
import { readLock } from '../db/data-lock';
import { localKeyHeader } from './local-command-routes';
import { CommandError } from './command-error';

/** The server holding the data folder, when one is running and can take local commands. */
export function runningServer(config: Config): { url: string; key: string } | undefined {
  if (config.databaseUrl) return undefined;
  const holder = readLock(config.dataDir);
  if (!holder) return undefined;
  if (!holder.url || !holder.localKey) {
    throw new CommandError(
      `The data folder ${config.dataDir} is in use by ${holder.purpose} (process ${holder.pid}). PGlite lets only one process open a data folder; wait for it to finish.`,
      1,
    );
  }
  return { url: holder.url, key: holder.localKey };
}

/** Calls a local-command route of the running server; answers its JSON or throws its message. */
export async function callRunningServer<Answer>(
  server: { url: string; key: string },
  path: string,
  init: { method: string; body?: BodyInit; contentType?: string },
): Promise<{ status: number; body: Answer }> {
  let response: Response;
  try {
    response = await fetch(`${server.url}/api/local${path}`, {
      method: init.method,
      headers: {
        [localKeyHeader]: server.key,
        ...(init.contentType ? { 'content-type': init.contentType } : {}),
      },
      body: init.body,
    });
  } catch (error) {
    throw new CommandError(
      `A Tuttiboard server holds the data folder but did not answer at ${server.url} (${error instanceof Error ? error.message : error}).`,
      1,
    );
  }
  const body = (await response.json()) as Answer;
  return { status: response.status, body };
}
