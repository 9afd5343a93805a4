import { eq } from 'drizzle-orm';
import { zipSync, strToU8 } from 'fflate';
import type { ImportResult } from '@shared/api/import';
import type { SyncSettings, SyncSettingsInput } from '@shared/api/oneroster';
import type { Config } from '../config';
import { recordAudit } from '../core/audit';
import { badRequest, conflict } from '../core/errors';
import type { Actor } from '../core/policy';
import type { Database, DatabaseHandle } from '../db/client';
import { oneRosterSync } from '../db/schema/index';
import { importRoster, isUnreadable } from '../imports/imports-service';
import { fetchRoster, SyncError } from './rest-client';
import { openSecret, sealSecret } from './secret-box';

const settingsId = 1;
type SyncRow = typeof oneRosterSync.$inferSelect;

function shown(row: SyncRow | undefined): SyncSettings {
  return {
    configured: row !== undefined,
    baseUrl: row?.baseUrl ?? '',
    apiVersion: (row?.apiVersion as '1.1' | '1.2' | undefined) ?? '1.2',
    tokenUrl: row?.tokenUrl ?? '',
    clientId: row?.clientId ?? '',
    hasSecret: Boolean(row?.clientSecretEncrypted),
    enabled: row?.enabled ?? false,
    runAt: row?.runAt ?? '02:00',
    changedSince: row?.changedSince?.toISOString() ?? null,
    lastRunAt: row?.lastRunAt?.toISOString() ?? null,
    lastOutcome: row?.lastOutcome ?? null,
    lastError: row?.lastError ?? null,
    version: row?.version ?? 0,
  };
}

// The audit log keeps what changed, never the secret itself.
function audited(row: SyncRow | undefined) {
  if (!row) return undefined;
  const { clientSecretEncrypted: _secret, ...rest } = row;
  return rest;
}

async function settingsRow(db: Database): Promise<SyncRow | undefined> {
  const [row] = await db.select().from(oneRosterSync).where(eq(oneRosterSync.id, settingsId));
  return row;
}

/** The district's OneRoster REST sync settings, without the secret. */
export async function readSyncSettings(db: Database): Promise<SyncSettings> {
  return shown(await settingsRow(db));
}

/**
 * Saves the sync settings. The client secret is sealed with TUTTI_SECRET_KEY; without the key it
 * cannot be saved. A new secret may be left out to keep the saved one. A change of provider or
 * version starts the next run afresh (a whole roster rather than changes).
 */
export async function saveSyncSettings(
  db: Database,
  config: Config,
  actor: Actor,
  input: SyncSettingsInput,
): Promise<SyncSettings> {
  if (!config.secretKey)
    throw badRequest(
      'The server has no TUTTI_SECRET_KEY, so it cannot keep the client secret; set it (at least 32 random characters) and restart.',
    );
  return db.transaction(async (tx) => {
    const [before] = await tx.select().from(oneRosterSync).where(eq(oneRosterSync.id, settingsId));
    if (before && input.version !== undefined && input.version !== before.version) throw conflict();
    if (!before && !input.clientSecret)
      throw badRequest('Give the client secret.', [
        { field: 'clientSecret', message: 'Give the client secret.' },
      ]);
    const provider = before
      ? before.baseUrl !== input.baseUrl || before.apiVersion !== input.apiVersion
      : true;
    const values = {
      baseUrl: input.baseUrl,
      apiVersion: input.apiVersion,
      tokenUrl: input.tokenUrl,
      clientId: input.clientId,
      clientSecretEncrypted: input.clientSecret
        ? sealSecret(config.secretKey!, input.clientSecret)
        : before!.clientSecretEncrypted,
      enabled: input.enabled,
      runAt: input.runAt,
      ...(provider ? { changedSince: null } : {}),
      updatedAt: new Date(),
    };
    const [row] = before
      ? await tx
          .update(oneRosterSync)
          .set({ ...values, version: before.version + 1 })
          .where(eq(oneRosterSync.id, settingsId))
          .returning()
      : await tx
          .insert(oneRosterSync)
          .values({ id: settingsId, ...values })
          .returning();
    await recordAudit(tx, actor, {
      action: before ? 'update' : 'create',
      entity: 'oneroster_sync',
      entityId: settingsId,
      before: audited(before),
      after: { ...audited(row), secretChanged: Boolean(input.clientSecret) },
    });
    return shown(row);
  });
}

/** What a sync run did: the import's result, or why it could not fetch the roster. */
export interface SyncRun {
  result: ImportResult;
  /** Set when the roster could not be fetched or read: the run is recorded as failed. */
  failure?: string;
  importId?: number;
}

async function noteRun(db: Database, outcome: string, error: string | null, changedSince?: Date) {
  await db
    .update(oneRosterSync)
    .set({
      lastRunAt: new Date(),
      lastOutcome: outcome,
      lastError: error,
      ...(changedSince ? { changedSince } : {}),
    })
    .where(eq(oneRosterSync.id, settingsId));
}

const nothingDone: ImportResult = {
  rows: 0,
  created: 0,
  updated: 0,
  unchanged: 0,
  withdrawn: 0,
  errors: [],
  committed: false,
};

/**
 * Runs the saved OneRoster REST sync once: fetches the roster (only the changes since the last
 * committed run, once there was one), then plans and commits it as an uploaded bundle with the
 * same rules (all or nothing unless `skipInvalid`). A provider that cannot be reached, refuses
 * the client, times out or answers something other than JSON makes the run fail with the reason
 * and write nothing to the roster; the next scheduled run tries again.
 */
export async function runSync(
  database: DatabaseHandle,
  config: Config,
  options: { dryRun: boolean; skipInvalid: boolean; actor: Actor | null; via: 'cli' | 'api' },
  timeoutMs?: number,
): Promise<SyncRun> {
  const row = await settingsRow(database.db);
  if (!row) throw badRequest('No OneRoster REST sync is set up; a coordinator sets it up first.');
  if (!config.secretKey)
    throw badRequest('The server has no TUTTI_SECRET_KEY, so it cannot read the client secret.');
  let clientSecret: string;
  try {
    clientSecret = openSecret(config.secretKey, row.clientSecretEncrypted);
  } catch {
    const failure =
      'The saved client secret cannot be read with this TUTTI_SECRET_KEY; save the secret again.';
    await noteRun(database.db, 'failed', failure);
    return { result: nothingDone, failure };
  }
  let fetched;
  try {
    fetched = await fetchRoster(
      {
        baseUrl: row.baseUrl,
        apiVersion: row.apiVersion as '1.1' | '1.2',
        tokenUrl: row.tokenUrl,
        clientId: row.clientId,
        clientSecret,
      },
      row.changedSince,
      timeoutMs,
    );
  } catch (error) {
    if (!(error instanceof SyncError)) throw error;
    // A SyncError's message is ours and never holds the secret; still, take it out if it did.
    const failure = error.message.replaceAll(clientSecret, '•••');
    await noteRun(database.db, 'failed', failure);
    return { result: nothingDone, failure };
  }
  const entries: Record<string, Uint8Array> = {};
  for (const [name, text] of fetched.files) entries[name] = strToU8(text);
  const since = row.changedSince ? ` changes since ${row.changedSince.toISOString()}` : '';
  const fileName = `OneRoster REST sync${since}.zip`.slice(0, 200);
  const outcome = await importRoster(
    database,
    {
      upload: { fileName, bytes: zipSync(entries) },
      withdrawMissing: false,
      skipInvalid: options.skipInvalid,
      dryRun: options.dryRun,
    },
    options.actor,
    { fileName, via: options.via },
  );
  if (options.dryRun) {
    await noteRun(database.db, 'dry run', null);
  } else if (outcome.result.committed) {
    await noteRun(database.db, 'committed', null, fetched.newest ?? undefined);
  } else if (outcome.result.errors.length === 0) {
    await noteRun(database.db, 'no changes', null, fetched.newest ?? undefined);
  } else {
    const failure = isUnreadable(outcome.plan.parsed)
      ? 'The provider’s roster could not be read.'
      : `${outcome.result.errors.length} rows had errors; nothing was written.`;
    await noteRun(database.db, 'failed', failure);
    return { result: outcome.result, failure, importId: outcome.importId };
  }
  return { result: outcome.result, importId: outcome.importId };
}
