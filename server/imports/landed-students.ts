import { sql } from 'drizzle-orm';
import { rowsOf, type DatabaseHandle } from '../db/client';
import { inSqlTransaction } from './sql-session';

/**
 * Takes back out the students (and new ensembles) a roster import added ahead of its final
 * transaction (`roster_import_landings`): those of one run, or of every run at start-up, when a
 * crash stopped an import before its end. Imports now commit in one transaction and land
 * nothing ahead (see `commitImport`); this settles a data folder an earlier version left so. A student someone has since
 * recorded a pass-off or a loan for stays, as if imported, so no one's work is lost; their
 * landing row goes all the same. Answers how many students were taken out.
 */
export async function takeBackLanded(database: DatabaseHandle, run?: string): Promise<number> {
  return inSqlTransaction(database, async (session) => {
    const [taken] = await session.query<{ count: number }>(
      `with taken as (
         delete from students s using roster_import_landings l
         where s.id = l.student_id and ($1::text is null or l.run = $1::text)
           and not exists (select 1 from pass_offs p where p.student_id = s.id)
           and not exists (select 1 from loans o where o.student_id = s.id)
         returning s.id
       )
       select count(*)::int as count from taken`,
      [run ?? null],
    );
    // Then the ensembles it created, unless someone has seated a student in one since.
    await session.query(
      `delete from ensembles e using roster_import_landings l
       where e.id = l.ensemble_id and ($1::text is null or l.run = $1::text)
         and not exists (select 1 from enrollments en where en.ensemble_id = e.id)`,
      [run ?? null],
    );
    await session.query(
      `delete from roster_import_landings where $1::text is null or run = $1::text`,
      [run ?? null],
    );
    return taken!.count;
  });
}

/** At start-up: takes back the students of any import a crash left unfinished. */
export async function settleUnfinishedImports(database: DatabaseHandle): Promise<number> {
  const [pending] = rowsOf<{ any: boolean }>(
    await database.db.execute(sql`select exists (select 1 from roster_import_landings) as any`),
  );
  return pending!.any ? takeBackLanded(database) : 0;
}
