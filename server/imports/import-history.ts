import { and, count, desc, eq, sql, type SQL } from 'drizzle-orm';
import type { PgColumn } from 'drizzle-orm/pg-core';
import { z } from 'zod';
import {
  planListLimit,
  type ImportDetail,
  type ImportHistoryEntry,
  type ImportRowError,
} from '@shared/api/import';
import type { ListResponse } from '@shared/api/list';
import { csvField } from '@shared/roster';
import { listPage, matchesText, orderFor, parseListQuery } from '../core/list-query';
import { notFound } from '../core/errors';
import type { Database } from '../db/client';
import { rosterImports, users } from '../db/schema/index';

const historyFilters = z.object({
  committed: z.enum(['true', 'false']).optional(),
  via: z.enum(['wizard', 'cli', 'api']).optional(),
});

const errorCount = sql<number>`jsonb_array_length(${rosterImports.errors})::int`;

const historyColumns = {
  id: rosterImports.id,
  fileName: rosterImports.fileName,
  source: rosterImports.source,
  via: rosterImports.via,
  committed: rosterImports.committed,
  rows: rosterImports.rows,
  created: rosterImports.created,
  updated: rosterImports.updated,
  unchanged: rosterImports.unchanged,
  withdrawn: rosterImports.withdrawn,
  errorCount,
  userName: users.name,
  createdAt: rosterImports.createdAt,
  undoneAt: rosterImports.undoneAt,
};

/** The imports with who ran them: {@link historyColumns} and the `extra` columns a caller adds. */
function selectImports<Extra extends Record<string, PgColumn>>(db: Database, extra: Extra) {
  return db
    .select({ ...historyColumns, ...extra })
    .from(rosterImports)
    .leftJoin(users, eq(users.id, rosterImports.userId));
}

const sortable = {
  createdAt: rosterImports.createdAt,
  fileName: rosterImports.fileName,
  rows: rosterImports.rows,
  created: rosterImports.created,
  updated: rosterImports.updated,
  withdrawn: rosterImports.withdrawn,
  errorCount,
};

type HistoryRow = Omit<ImportHistoryEntry, 'createdAt' | 'undoneAt'> & {
  createdAt: Date;
  undoneAt: Date | null;
};

function toEntry(row: HistoryRow): ImportHistoryEntry {
  return {
    ...row,
    createdAt: row.createdAt.toISOString(),
    undoneAt: row.undoneAt?.toISOString() ?? null,
  };
}

/** Past imports, newest first unless sorted otherwise, with the list contract. */
export async function listImports(
  db: Database,
  query: unknown,
): Promise<ListResponse<ImportHistoryEntry>> {
  const list = parseListQuery(query, historyFilters);
  const conditions: (SQL | undefined)[] = [];
  conditions.push(matchesText(list.q, [rosterImports.fileName]));
  if (list.committed) conditions.push(eq(rosterImports.committed, list.committed === 'true'));
  if (list.via) conditions.push(eq(rosterImports.via, list.via));
  const where = and(...conditions);
  return listPage(
    list,
    orderFor(list.sort, sortable, 'createdAt:desc', rosterImports.id),
    selectImports(db, {}).where(where).$dynamic(),
    db.select({ total: count() }).from(rosterImports).where(where),
    (row) => toEntry(row as HistoryRow),
  );
}

async function importRow(db: Database, id: number) {
  const [row] = await selectImports(db, { errors: rosterImports.errors })
    .where(eq(rosterImports.id, id))
    .orderBy(desc(rosterImports.id));
  if (!row) throw notFound('That import');
  return row as HistoryRow & { errors: ImportRowError[] };
}

/** One past import with its first errors. */
export async function getImport(db: Database, id: number): Promise<ImportDetail> {
  const { errors, ...row } = await importRow(db, id);
  return { ...toEntry(row), errors: errors.slice(0, planListLimit) };
}

/**
 * An import's errors as CSV (line, column, message), every cell neutralised against
 * spreadsheet formulas, CRLF line breaks per RFC 4180.
 */
export async function importErrorsCsv(
  db: Database,
  id: number,
): Promise<{ fileName: string; csv: string }> {
  const { errors } = await importRow(db, id);
  const lines = ['line,column,message'];
  for (const error of errors) {
    lines.push([String(error.line), error.column, error.message].map(csvField).join(','));
  }
  return { fileName: `roster-import-${id}-errors.csv`, csv: `${lines.join('\r\n')}\r\n` };
}
