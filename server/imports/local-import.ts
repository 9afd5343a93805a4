import express, { type RequestHandler } from 'express';
import type { ImportResult, PlannedEnsemble } from '@shared/api/import';
import type { DatabaseHandle } from '../db/client';
import type { Config } from '../config';
import { runSync } from '../oneroster/sync-service';
import { importRoster } from './imports-service';

/** What `tutti import` gets back, from the running server or from its own run. */
export interface ImportRun {
  result: ImportResult;
  /** The file could not be read as a roster at all. */
  unreadable: boolean;
  /** Whether the plan could be committed (for a dry run: whether it would be). */
  canCommit: boolean;
  newEnsembles: PlannedEnsemble[];
}

/** A large district's whole roster still fits; the wizard's own limit is smaller. */
const largestLocalUpload = 200 * 1024 * 1024;

function safeDecode(text: string): string {
  try {
    return decodeURIComponent(text).slice(0, 200);
  } catch {
    return text.slice(0, 200);
  }
}

const isOn = (value: unknown) => value === '1' || value === 'true';

/** Runs `tutti import` for a file and answers what {@link ImportRun} says. */
export async function runImport(
  database: DatabaseHandle,
  upload: Parameters<typeof importRoster>[1]['upload'],
  flags: { dryRun: boolean; skipInvalid: boolean; withdrawMissing: boolean },
  fileName: string,
): Promise<ImportRun> {
  const outcome = await importRoster(
    database,
    {
      upload,
      withdrawMissing: flags.withdrawMissing,
      skipInvalid: flags.skipInvalid,
      dryRun: flags.dryRun,
    },
    null,
    { fileName, via: 'cli' },
  );
  return {
    result: outcome.result,
    unreadable: outcome.unreadable,
    canCommit: outcome.plan.canCommit,
    newEnsembles: outcome.plan.newEnsembles,
  };
}

/**
 * `POST /api/local/imports?dryRun=&skipInvalid=&withdrawMissing=`: the file's bytes as the body
 * and its name in `x-file-name` (or the `fileName` query parameter), for `tutti import` while this server holds the data folder.
 * The import's actor is "tutti import" (no user).
 */
export function localImportHandlers(database: DatabaseHandle): RequestHandler[] {
  return [
    express.raw({ type: () => true, limit: largestLocalUpload }),
    async (request, response) => {
      const body: unknown = request.body;
      const bytes = Buffer.isBuffer(body)
        ? new Uint8Array(body.buffer, body.byteOffset, body.byteLength)
        : new Uint8Array();
      const named = request.get('x-file-name') ?? request.query['fileName'];
      const fileName = typeof named === 'string' && named !== '' ? safeDecode(named) : 'roster.csv';
      const flags = {
        dryRun: isOn(request.query['dryRun']),
        skipInvalid: isOn(request.query['skipInvalid']),
        withdrawMissing: isOn(request.query['withdrawMissing']),
      };
      response.json(await runImport(database, { fileName, bytes }, flags, fileName));
    },
  ];
}

/** A sync run as `tutti import --from-oneroster-api` reports it. */
export async function runOneRosterSync(
  database: DatabaseHandle,
  config: Config,
  flags: { dryRun: boolean; skipInvalid: boolean },
): Promise<ImportRun> {
  const run = await runSync(database, config, { ...flags, actor: null, via: 'cli' });
  return {
    result:
      run.failure && run.result.errors.length === 0
        ? { ...run.result, errors: [{ line: 0, column: '', message: run.failure }] }
        : run.result,
    // A provider that cannot be reached or read is like a file that cannot be read.
    unreadable: run.failure !== undefined && run.result.errors.length === 0,
    canCommit: run.failure === undefined,
    newEnsembles: [],
  };
}
