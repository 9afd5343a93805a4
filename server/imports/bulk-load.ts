import { sql } from 'drizzle-orm';
import { rowsOf, type DatabaseHandle } from '../db/client';
import type { ImportPlan } from './import-plan';
import type { SqlSession } from './sql-session';

/** The tables an import writes, whose triggers {@link skipReferenceTriggers} looks at. */
const importedTables = [
  'students',
  'enrollments',
  'ensembles',
  'school_moves',
  'audit_log',
  'roster_imports',
  'roster_import_changes',
];

/**
 * In PGlite, where this transaction is the only one running, skips the per-row foreign-key
 * triggers for the rest of the transaction (PostgreSQL's `session_replication_role = replica`
 * fires no ordinary trigger): every school, ensemble, year and student id written was read in
 * this same transaction, and the per-row checks would otherwise cost more than the writes. Our
 * own triggers are enabled ALWAYS (migration 0007), so they still fire; a table with any other
 * trigger keeps the checks on. The table names are the code's own, written in as literals.
 */
export async function skipReferenceTriggers(
  session: Pick<SqlSession, 'query'>,
  writtenTables: readonly string[] = importedTables,
): Promise<void> {
  const [own] = await session.query<{ count: number }>(
    `select count(*)::int as count from pg_trigger
     where not tgisinternal and tgenabled <> 'A'
       and tgrelid = any(array[${writtenTables.map((name) => `'${name.replaceAll("'", "''")}'::regclass`).join(', ')}])`,
  );
  if (own!.count === 0) await session.query(`set local session_replication_role = replica`);
}

/**
 * The tables whose secondary indexes a bulk load (see {@link loadsInBulk}) drops before the new
 * students go in and builds again once their seats are in: each new student adds rows to all
 * three.
 */
const bulkLoadedTables = ['students', 'student_attainment', 'enrollments'];

/** Runs one statement with no parameters and answers its rows. */
export type RunStatement = (text: string) => Promise<Record<string, unknown>[]>;

/**
 * Drops the indexes of the tables (by default {@link bulkLoadedTables}) that enforce nothing
 * (not unique, no constraint's) and answers the statements that create them again, read from
 * the catalog so a later migration's indexes are included. With `columns`, only those whose
 * keys, expressions or predicate read one of these columns (the index's dependencies on them in
 * `pg_depend`). Transactional: a rollback brings them back. The table and column names are the
 * code's own, written into the statement as literals.
 */
export async function dropSecondaryIndexes(
  run: RunStatement,
  tables: readonly string[] = bulkLoadedTables,
  columns?: readonly string[],
): Promise<string[]> {
  const literals = (names: readonly string[]) =>
    names.map((name) => `'${name.replaceAll("'", "''")}'`).join(', ');
  const readingColumns = columns
    ? `and exists (
         select 1 from pg_depend d
         join pg_attribute a on a.attrelid = d.refobjid and a.attnum = d.refobjsubid
         where d.classid = 'pg_class'::regclass and d.objid = i.indexrelid
           and d.refobjid = i.indrelid and a.attname = any(array[${literals(columns)}]::name[]))`
    : '';
  const indexes = (await run(
    `select quote_ident(c.relname) as name, pg_get_indexdef(i.indexrelid) as definition
     from pg_index i join pg_class c on c.oid = i.indexrelid
     where i.indrelid = any(array[${literals(tables)}]::regclass[]) and not i.indisunique
       and not exists (select 1 from pg_constraint k where k.conindid = i.indexrelid)
       ${readingColumns}
     order by c.relname`,
  )) as { name: string; definition: string }[];
  for (const { name } of indexes) await run(`drop index ${name}`);
  return indexes.map((index) => index.definition);
}

/** New students below which an import never loads in bulk. */
export const bulkLoadAtLeast = 2_000;

/**
 * Whether an import adds at least {@link bulkLoadAtLeast} new students and at least four times
 * as many as the roster already holds (a district's first import, or one that dwarfs the
 * roster): then, in PGlite, its new students and their seats go in while the secondary indexes
 * of {@link bulkLoadedTables} are dropped, and the indexes are built again after, in the same
 * transaction. PostgreSQL's manual advises this for bulk loads (14.4.3 "Remove Indexes"):
 * building an index over all the rows at once is cheaper than adding rows to it one at a time,
 * but the build reads the rows already there too. Measured here: 18,000 new students into a
 * fresh district took ~0.8 s to COPY with every index, ~0.3 s without them plus ~0.35 s to
 * build them; 20,000 into a roster of 50,000, 0.5 s with the indexes against 1.3 s to build
 * them again, so the build pays only when the new rows far outnumber the old. On a PostgreSQL
 * server dropping an index would lock the table for everyone, so the import keeps its indexes.
 */
export async function loadsInBulk(database: DatabaseHandle, plan: ImportPlan): Promise<boolean> {
  const created = plan.createdStudents.length;
  if (database.kind !== 'pglite' || !plan.canCommit || created < bulkLoadAtLeast) return false;
  const [roster] = rowsOf<{ students: number }>(
    await database.db.execute(
      sql`select coalesce(sum(students), 0)::int as students from student_counts`,
    ),
  );
  return created >= 4 * roster!.students;
}
