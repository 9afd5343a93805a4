import { eq, inArray } from 'drizzle-orm';
import type { Database, Transaction } from '../db/client';
import { instruments, schools } from '../db/schema/index';
import {
  fleetCsvColumns,
  instrumentConditions,
  type FleetImportResult,
  type InstrumentCondition,
} from '@shared/api/instrument';
import { resolveInstrument } from '@shared/roster/index';
import { decodeText } from '../imports/parse/decode';
import { parseCsv } from '../imports/parse/parse-csv';
import { inScope, type Actor } from '../core/policy';
import { recordAudit } from '../core/audit';
import { recordInstrumentEvents } from './instrument-events';

type ImportError = FleetImportResult['errors'][number];

/** One valid line of a fleet CSV, as the columns it sets. */
interface FleetRow {
  line: number;
  assetTag: string;
  instrumentId: string;
  homeSchoolId: number;
  maker?: string;
  model?: string;
  serial?: string;
  purchasedOn?: string | null;
  purchaseCostCents?: number | null;
  fundingSource?: string;
  condition?: InstrumentCondition;
}

const requiredColumns = ['asset_tag', 'instrument', 'home_school_code'] as const;

/** A date as YYYY-MM-DD from YYYY-MM-DD or M/D/YYYY; undefined when it is not a real date. */
export function parseFleetDate(cell: string): string | undefined {
  const iso = /^(\d{4})-(\d{1,2})-(\d{1,2})$/.exec(cell);
  const us = /^(\d{1,2})\/(\d{1,2})\/(\d{4})$/.exec(cell);
  const [year, month, day] = iso
    ? [iso[1], iso[2], iso[3]]
    : us
      ? [us[3], us[1], us[2]]
      : [undefined, undefined, undefined];
  if (!year) return undefined;
  const text = `${year}-${month!.padStart(2, '0')}-${day!.padStart(2, '0')}`;
  const parsed = new Date(`${text}T00:00:00Z`);
  return !Number.isNaN(parsed.getTime()) && parsed.toISOString().startsWith(text)
    ? text
    : undefined;
}

/** Dollars ("1234.50", "$1,234.50") as whole cents; undefined when it is not an amount. */
export function parseDollars(cell: string): number | undefined {
  const cleaned = cell.replace(/[$,\s]/g, '');
  if (!/^\d+(\.\d{1,2})?$/.test(cleaned)) return undefined;
  return Math.round(Number(cleaned) * 100);
}

function checkRow(
  line: number,
  cells: Record<string, string>,
  schoolIds: Map<string, number>,
  actor: Actor,
  errors: ImportError[],
): FleetRow | undefined {
  const before = errors.length;
  const fail = (column: string, message: string) => errors.push({ line, column, message });
  const has = (column: string) => column in cells;
  const cell = (column: string) => (cells[column] ?? '').trim();
  const assetTag = cell('asset_tag').toUpperCase();
  if (!/^[A-Z0-9][A-Z0-9-]{1,31}$/.test(assetTag)) {
    fail(
      'asset_tag',
      assetTag
        ? `'${assetTag}' is not an asset tag: 2 to 32 letters, digits or dashes.`
        : 'The asset tag is empty.',
    );
  }
  const instrumentId = resolveInstrument(cell('instrument'));
  if (!instrumentId)
    fail('instrument', `'${cell('instrument')}' is not an instrument the district knows.`);
  const code = cell('home_school_code').toUpperCase();
  const homeSchoolId = schoolIds.get(code);
  if (homeSchoolId === undefined || !inScope(actor, homeSchoolId)) {
    fail(
      'home_school_code',
      code ? `There is no school with the code ${code}.` : 'The home school code is empty.',
    );
  }
  const row: FleetRow = {
    line,
    assetTag,
    instrumentId: instrumentId ?? '',
    homeSchoolId: homeSchoolId ?? 0,
  };
  for (const column of ['maker', 'model', 'serial', 'funding_source'] as const) {
    if (!has(column)) continue;
    if (cell(column).length > 120) fail(column, 'At most 120 characters.');
    row[column === 'funding_source' ? 'fundingSource' : column] = cell(column);
  }
  if (has('purchased_on')) {
    const date = cell('purchased_on') === '' ? null : parseFleetDate(cell('purchased_on'));
    if (date === undefined)
      fail('purchased_on', `'${cell('purchased_on')}' is not a date; write YYYY-MM-DD.`);
    else row.purchasedOn = date;
  }
  if (has('purchase_cost')) {
    const cents = cell('purchase_cost') === '' ? null : parseDollars(cell('purchase_cost'));
    if (cents === undefined)
      fail(
        'purchase_cost',
        `'${cell('purchase_cost')}' is not an amount in dollars, such as 1450.00.`,
      );
    else row.purchaseCostCents = cents;
  }
  if (has('condition') && cell('condition') !== '') {
    const condition = cell('condition').toLowerCase() as InstrumentCondition;
    if (!instrumentConditions.includes(condition)) {
      fail(
        'condition',
        `'${cell('condition')}' is not a condition: ${instrumentConditions.join(', ')}.`,
      );
    } else row.condition = condition;
  }
  return errors.length === before ? row : undefined;
}

type Existing = typeof instruments.$inferSelect;

function changesOf(row: FleetRow, existing: Existing): Partial<Existing> {
  const { line: _line, ...wanted } = row;
  const changes: Partial<Existing> = {};
  for (const [key, value] of Object.entries(wanted) as [keyof Existing, unknown][]) {
    if (value !== undefined && existing[key] !== value)
      (changes as Record<string, unknown>)[key] = value;
  }
  return changes;
}

/** The header's problems: a required column missing, a column we do not know. */
function headerErrors(headers: string[]): ImportError[] {
  const errors: ImportError[] = [];
  for (const column of requiredColumns) {
    if (!headers.includes(column))
      errors.push({ line: 1, column, message: `The file has no ${column} column.` });
  }
  const unknown = headers.filter(
    (header) => !(fleetCsvColumns as readonly string[]).includes(header),
  );
  for (const column of unknown)
    errors.push({
      line: 1,
      column,
      message: `Unknown column; the columns are ${fleetCsvColumns.join(', ')}.`,
    });
  return errors;
}

/** The file's lines checked, each asset tag once; the problems go into `errors`. */
async function checkedRows(
  db: Database,
  actor: Actor,
  records: ReturnType<typeof parseCsv>['records'],
  errors: ImportError[],
): Promise<FleetRow[]> {
  const schoolIds = new Map(
    (await db.select({ id: schools.id, code: schools.code }).from(schools)).map((school) => [
      school.code,
      school.id,
    ]),
  );
  const rows: FleetRow[] = [];
  const firstLineOf = new Map<string, number>();
  for (const record of records) {
    const cells = Object.fromEntries(
      Object.entries(record.cells).map(([header, value]) => [header.trim().toLowerCase(), value]),
    );
    const row = checkRow(record.line, cells, schoolIds, actor, errors);
    if (!row) continue;
    const first = firstLineOf.get(row.assetTag);
    if (first !== undefined) {
      errors.push({
        line: row.line,
        column: 'asset_tag',
        message: `${row.assetTag} is already on line ${first}.`,
      });
      continue;
    }
    firstLineOf.set(row.assetTag, row.line);
    rows.push(row);
  }
  return rows;
}

/** The instruments already in the fleet with the rows' asset tags, read 1,000 tags at a time. */
async function existingByTag(db: Database, rows: FleetRow[]): Promise<Map<string, Existing>> {
  const existing = new Map<string, Existing>();
  for (let start = 0; start < rows.length; start += 1000) {
    const tags = rows.slice(start, start + 1000).map((row) => row.assetTag);
    for (const found of await db
      .select()
      .from(instruments)
      .where(inArray(instruments.assetTag, tags)))
      existing.set(found.assetTag, found);
  }
  return existing;
}

/**
 * Imports a fleet CSV all or nothing: every line is checked first, and only a file with no
 * errors is written, in one transaction. Instruments are matched by asset tag.
 */
export async function importFleet(
  db: Database,
  actor: Actor,
  bytes: Uint8Array,
  dryRun: boolean,
): Promise<FleetImportResult> {
  const parsed = parseCsv(decodeText(bytes).text);
  const headers = parsed.headers.map((header) => header.trim().toLowerCase());
  const errors: ImportError[] = [...parsed.problems, ...headerErrors(headers)];
  const rows = await checkedRows(db, actor, parsed.records, errors);
  const existing = await existingByTag(db, rows);
  const toCreate = rows.filter((row) => !existing.has(row.assetTag));
  const toUpdate = rows
    .map((row) => ({ row, before: existing.get(row.assetTag) }))
    .filter((entry): entry is { row: FleetRow; before: Existing } => entry.before !== undefined)
    .map((entry) => ({ ...entry, changes: changesOf(entry.row, entry.before) }))
    .filter((entry) => Object.keys(entry.changes).length > 0);
  const result: FleetImportResult = {
    rows: parsed.records.length,
    created: toCreate.length,
    updated: toUpdate.length,
    unchanged: rows.length - toCreate.length - toUpdate.length,
    errors: errors.sort((a, b) => a.line - b.line),
    committed: false,
  };
  if (errors.length > 0 || dryRun) return result;
  await db.transaction(async (tx) => {
    await insertCreated(tx, actor, toCreate);
    for (const { before, changes } of toUpdate) {
      await tx
        .update(instruments)
        .set({ ...changes, version: before.version + 1, updatedAt: new Date() })
        .where(eq(instruments.id, before.id));
    }
    await recordAudit(tx, actor, {
      action: 'import',
      entity: 'instrument',
      entityId: 'fleet-csv',
      after: { created: result.created, updated: result.updated, unchanged: result.unchanged },
    });
  });
  return { ...result, committed: true };
}

async function insertCreated(tx: Transaction, actor: Actor, rows: FleetRow[]) {
  for (let start = 0; start < rows.length; start += 500) {
    const batch = rows.slice(start, start + 500).map(({ line: _line, ...row }) => row);
    const inserted = await tx
      .insert(instruments)
      .values(batch)
      .returning({ id: instruments.id, purchasedOn: instruments.purchasedOn });
    await recordInstrumentEvents(
      tx,
      ...inserted.map((row) => ({
        instrumentId: row.id,
        kind: 'purchase' as const,
        note: row.purchasedOn
          ? `Bought ${row.purchasedOn} (fleet import)`
          : 'Added by fleet import',
        userId: actor.userId,
      })),
    );
  }
}
