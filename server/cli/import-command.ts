import { readdir, readFile } from 'node:fs/promises';
import path from 'node:path';
import { zipSync } from 'fflate';
import type { ImportResult } from '@shared/api/import';
import type { Config } from '../config';
import { HttpError } from '../core/errors';
import { runImport, runOneRosterSync, type ImportRun } from '../imports/local-import';
import {
  UnreadableUploadError,
  uploadFromPath,
  uploadName,
  type RosterUpload,
} from '../imports/read-upload';
import { CommandError } from './command-error';
import { withCommandDatabase } from './command-database';
import { callRunningServer, runningServer } from './running-server';

const knownFlags = new Set([
  '--dry-run',
  '--json',
  '--skip-invalid',
  '--withdraw-missing',
  '--from-oneroster-api',
]);
const errorsShown = 10;

function parseArguments(args: string[]) {
  const files = args.filter((arg) => !arg.startsWith('--'));
  const flags = new Set(args.filter((arg) => arg.startsWith('--')));
  for (const flag of flags)
    if (!knownFlags.has(flag)) throw new CommandError(`Unknown option '${flag}'.`);
  const fromApi = flags.has('--from-oneroster-api');
  if (fromApi && files.length > 0)
    throw new CommandError('--from-oneroster-api runs the saved sync; name no file with it.');
  if (fromApi && flags.has('--withdraw-missing'))
    throw new CommandError(
      '--withdraw-missing does not apply to the sync: the provider marks who has left.',
    );
  if (files.length === 0 && !fromApi)
    throw new CommandError(
      'Name the roster to import: a CSV file, a OneRoster zip or a OneRoster folder.',
    );
  if (files.length > 1)
    throw new CommandError(`Import one roster at a time (got ${files.length} files).`);
  return {
    file: files[0] ?? '',
    fromApi,
    dryRun: flags.has('--dry-run'),
    json: flags.has('--json'),
    skipInvalid: flags.has('--skip-invalid'),
    withdrawMissing: flags.has('--withdraw-missing'),
  };
}

/** A OneRoster folder as a zip of its files, to send to the running server. */
async function zipped(folder: string): Promise<Uint8Array> {
  const entries: Record<string, Uint8Array> = {};
  for (const name of await readdir(folder)) {
    if (name.toLowerCase().endsWith('.csv'))
      entries[name] = new Uint8Array(await readFile(path.join(folder, name)));
  }
  return zipSync(entries);
}

async function throughServer(
  server: { url: string; key: string },
  upload: RosterUpload,
  options: ReturnType<typeof parseArguments>,
): Promise<ImportRun> {
  const bytes = 'folder' in upload ? await zipped(upload.folder) : upload.bytes;
  const name = 'folder' in upload ? `${uploadName(upload)}.zip` : upload.fileName;
  const query = new URLSearchParams({
    dryRun: String(options.dryRun),
    skipInvalid: String(options.skipInvalid),
    withdrawMissing: String(options.withdrawMissing),
    fileName: name,
  });
  const answer = await callRunningServer<ImportRun & { error?: { message: string } }>(
    server,
    `/imports?${query}`,
    {
      method: 'POST',
      body: new Blob([bytes as BlobPart]),
      contentType: 'application/octet-stream',
    },
  );
  if (answer.status !== 200)
    throw new CommandError(
      answer.body.error?.message ?? `The server answered ${answer.status}.`,
      1,
    );
  return answer.body;
}

function contractJson(result: ImportResult): string {
  const { rows, created, updated, unchanged, withdrawn, errors, committed } = result;
  const listed = errors.map(({ line, column, message }) => ({ line, column, message }));
  return JSON.stringify({
    rows,
    created,
    updated,
    unchanged,
    withdrawn,
    errors: listed,
    committed,
  });
}

function summary(fileName: string, run: ImportRun, dryRun: boolean, skipInvalid: boolean): string {
  const { result } = run;
  const lines = [
    `Roster ${fileName}: ${result.rows} rows.`,
    `  created ${result.created}, updated ${result.updated}, unchanged ${result.unchanged}, withdrawn ${result.withdrawn}`,
  ];
  if (run.newEnsembles.length > 0) {
    lines.push(
      `  new ensembles: ${run.newEnsembles.map((ensemble) => `${ensemble.name} (${ensemble.schoolCode})`).join(', ')}`,
    );
  }
  if (result.errors.length > 0) {
    lines.push(`${result.errors.length} ${result.errors.length === 1 ? 'error' : 'errors'}:`);
    for (const error of result.errors.slice(0, errorsShown)) {
      lines.push(
        `  ${error.line > 0 ? `line ${error.line}` : 'file'}${error.column ? `, ${error.column}` : ''}: ${error.message}`,
      );
    }
    if (result.errors.length > errorsShown)
      lines.push(`  … and ${result.errors.length - errorsShown} more (--json lists them all).`);
  }
  if (result.committed)
    lines.push(
      skipInvalid && result.errors.length > 0
        ? 'Committed the valid rows; the rows with errors were skipped.'
        : 'Committed.',
    );
  else if (dryRun && run.canCommit)
    lines.push('Dry run: nothing was written; run again without --dry-run to commit.');
  else if (run.unreadable)
    lines.push('Nothing was imported: the file could not be read as a roster.');
  else
    lines.push(
      'Nothing was committed: fix the errors and import again, or add --skip-invalid to import the valid rows.',
    );
  return `${lines.join('\n')}\n`;
}

/** Prints a run's answer and gives the exit code of a file import. */
function report(fileName: string, run: ImportRun, options: ReturnType<typeof parseArguments>) {
  process.stdout.write(
    options.json
      ? `${contractJson(run.result)}\n`
      : summary(fileName, run, options.dryRun, options.skipInvalid),
  );
  if (run.unreadable) return 2;
  if (run.result.committed || (options.dryRun && run.canCommit)) return 0;
  return 1;
}

/**
 * `tutti import --from-oneroster-api [--dry-run] [--json] [--skip-invalid]`: runs the saved
 * OneRoster REST sync once, through the running server when one holds the data folder.
 */
async function syncCommand(config: Config, options: ReturnType<typeof parseArguments>) {
  const flags = { dryRun: options.dryRun, skipInvalid: options.skipInvalid };
  const server = runningServer(config);
  let run: ImportRun;
  if (server) {
    const answer = await callRunningServer<ImportRun & { error?: { message: string } }>(
      server,
      '/oneroster-sync',
      { method: 'POST', body: JSON.stringify(flags), contentType: 'application/json' },
    );
    if (answer.status !== 200)
      throw new CommandError(
        answer.body.error?.message ?? `The server answered ${answer.status}.`,
        2,
      );
    run = answer.body;
  } else {
    try {
      run = await withCommandDatabase(config, 'tutti import --from-oneroster-api', (database) =>
        runOneRosterSync(database, config, flags),
      );
    } catch (error) {
      if (error instanceof HttpError) throw new CommandError(error.message, 2);
      throw error;
    }
  }
  return report('from the OneRoster REST sync', run, options);
}

/**
 * `tutti import <file.csv | bundle.zip | folder> [--dry-run] [--json] [--skip-invalid]
 * [--withdraw-missing]`: parse, plan and commit a roster as the wizard does. Works through the
 * running server when one holds the data folder. Exit 0 when committed (or a clean dry run), 1
 * when rows had errors and nothing was committed, 2 for a bad command or an unreadable file.
 */
export async function importCommand(config: Config, args: string[]): Promise<number> {
  const options = parseArguments(args);
  if (options.fromApi) return syncCommand(config, options);
  let upload: RosterUpload;
  try {
    upload = await uploadFromPath(options.file);
  } catch (error) {
    if (!(error instanceof UnreadableUploadError)) throw error;
    if (options.json) {
      const result: ImportResult = {
        rows: 0,
        created: 0,
        updated: 0,
        unchanged: 0,
        withdrawn: 0,
        errors: [{ line: 0, column: '', message: error.message }],
        committed: false,
      };
      process.stdout.write(`${contractJson(result)}\n`);
    }
    process.stderr.write(`tutti import: ${error.message}\n`);
    return 2;
  }
  const fileName = uploadName(upload);
  const server = runningServer(config);
  const run = server
    ? await throughServer(server, upload, options)
    : await withCommandDatabase(config, `tutti import ${fileName}`, (database) =>
        runImport(database, upload, options, fileName),
      );
  return report(fileName, run, options);
}
