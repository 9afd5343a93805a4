import { sql } from 'drizzle-orm';
import { rowsOf, type Database } from './client';

/** The tables whose statistics a roster import changes. */
export const rosterTables = ['students', 'enrollments', 'student_attainment'];
/** The tables a rebuild of the ladder summaries rewrites. */
export const summaryTables = ['student_attainment', 'passed_requirements', 'pass_off_weeks'];

/**
 * Gathers the planner's statistics (PostgreSQL ANALYZE) after a bulk change. The embedded
 * database runs no autovacuum daemon, so without this a table filled by an import or a seed
 * keeps the statistics of when it was empty and queries are planned for the wrong sizes. On a
 * PostgreSQL server autovacuum would get there too; doing it at once costs a fraction of the
 * bulk change. With no tables named, every table of the database.
 */
export async function refreshStatistics(
  db: Database,
  tables: readonly string[] = [],
): Promise<void> {
  await db.execute(sql.raw(`analyze ${tables.map((table) => `"${table}"`).join(', ')}`));
}

/**
 * Whether `changed` rows call for new statistics on a table, by the rule PostgreSQL's
 * autovacuum applies (autovacuum_analyze_threshold 50 plus autovacuum_analyze_scale_factor 0.1
 * of the rows the table had when last analyzed), or when it has never been analyzed.
 */
export async function statisticsStale(
  db: Database,
  table: string,
  changed: number,
): Promise<boolean> {
  const [row] = rowsOf<{ reltuples: number }>(
    await db.execute(
      sql`select reltuples::float8 as reltuples from pg_class where oid = ${table}::regclass`,
    ),
  );
  const rows = row?.reltuples ?? -1;
  return rows < 0 || changed > 50 + 0.1 * rows;
}
