import { sql } from 'drizzle-orm';
import { rowsOf, yieldToRequests, type Database } from './client';

/** The tables whose statistics a roster import changes. */
export const rosterTables = ['students', 'enrollments', 'student_attainment'];
/** The tables a rebuild of the ladder summaries rewrites. */
export const summaryTables = ['student_attainment', 'passed_requirements', 'pass_off_weeks'];

/**
 * Vacuums and gathers the planner's statistics (PostgreSQL VACUUM (ANALYZE)) after a bulk
 * change. The embedded database runs no autovacuum daemon, so without this a table filled by an
 * import or a seed keeps the statistics of when it was empty and queries are planned for the
 * wrong sizes, and its visibility map stays empty, so no index-only scan can skip the table's
 * rows (a deep grid page finds its first key that way: server/students/students-queries.ts). On a
 * PostgreSQL server autovacuum would get there too; doing it at once costs a fraction of the
 * bulk change (about 10 ms for 50,000 students here). With no tables named, every table of the
 * database. PostgreSQL documentation: VACUUM, and "Routine Vacuuming: Updating the Visibility Map".
 */
export async function refreshStatistics(
  db: Database,
  tables: readonly string[] = [],
): Promise<void> {
  if (tables.length === 0) {
    await db.execute(sql.raw('vacuum (analyze)'));
    return;
  }
  // One statement per table: the embedded engine runs one statement at a time, and everyone
  // else's pages wait behind each (the three roster tables of a 70,000-student district in one
  // statement: ~420 ms).
  for (const table of tables) {
    await db.execute(sql.raw(`vacuum (analyze) "${table}"`));
    await yieldToRequests();
  }
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
