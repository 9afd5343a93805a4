import type { ImportResult } from '@shared/api/import';
import type { ColumnMapping } from '@shared/roster';
import type { Actor } from '../core/policy';
import type { DatabaseHandle } from '../db/client';
import { commitImport, type ImportMeta } from './import-commit';
import { planImport, uncommittedResult, type ImportPlan } from './import-plan';
import type { ParsedRoster } from './parse/parsed-roster';
import { listedStudentIds, readRosterUpload, type RosterUpload } from './read-upload';
import { orgMatching, rememberOrgSchools } from '../oneroster/oneroster-queries';

export { planImport, type ImportOptions, type ImportPlan } from './import-plan';
export { commitImport, type CommittedImport, type ImportMeta } from './import-commit';

/** One import as the wizard, the API and `tutti import` run it. */
export interface ImportRequest {
  upload: RosterUpload;
  mapping?: ColumnMapping;
  withdrawMissing: boolean;
  skipInvalid: boolean;
  /** Plan only: report what would happen and write nothing. */
  dryRun?: boolean;
}

/** What an import run did, with the plan behind it. */
export interface ImportOutcome {
  plan: ImportPlan;
  result: ImportResult;
  /** The history row, when one was written (not for a dry run). */
  importId?: number;
  /** Whether the upload could not be read at all (not a roster, not a bundle, empty). */
  unreadable: boolean;
}

/** Whether nothing in the upload could be read as roster rows. */
export function isUnreadable(parsed: ParsedRoster): boolean {
  return (
    parsed.totalRows === 0 &&
    parsed.rows.length === 0 &&
    parsed.errors.some((error) => error.line === 0)
  );
}

/** Reads an upload and plans its import against the database, writing nothing. */
export async function planUpload(
  database: DatabaseHandle,
  request: Omit<ImportRequest, 'dryRun'>,
): Promise<ImportPlan> {
  const matching = await orgMatching(database.db);
  const parsed = await readRosterUpload(request.upload, { mapping: request.mapping, ...matching });
  const listed =
    request.withdrawMissing && parsed.errors.length > 0
      ? await listedStudentIds(request.upload, parsed)
      : undefined;
  return planImport(database.db, parsed, {
    withdrawMissing: request.withdrawMissing,
    skipInvalid: request.skipInvalid,
    listedStudentIds: listed,
  });
}

/**
 * Runs an import end to end: parse, validate, plan, then (unless a dry run) commit in one
 * transaction. Without skip-invalid a file with any error commits nothing.
 */
export async function importRoster(
  database: DatabaseHandle,
  request: ImportRequest,
  actor: Actor | null,
  meta: ImportMeta,
): Promise<ImportOutcome> {
  const plan = await planUpload(database, request);
  const unreadable = isUnreadable(plan.parsed);
  if (request.dryRun || unreadable) return { plan, unreadable, result: uncommittedResult(plan) };
  const { importId, ...result } = await commitImport(database, plan, actor, meta);
  if (result.committed) await rememberOrgSchools(database.db, plan.parsed.matchedOrgs ?? []);
  return { plan, result, importId, unreadable };
}
