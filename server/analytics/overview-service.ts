import { sql } from 'drizzle-orm';
import { overviewQuerySchema, type Overview } from '@shared/api/analytics';
import type { Database } from '../db/client';
import { rowsOf } from '../db/client';
import { parseInput } from '../core/validate';
import type { Actor } from '../core/policy';
import { recomputeAttainment } from '../ladder/attainment';
import { activeRuleLadder, type Queryable } from '../ladder/ladder-queries';
import { today } from './analytics-scope';
import { passOffsPerWeek, quietDirectors, stalledStudents } from './activity-figures';
import { rungFigures, rungHistogram } from './rung-histogram';

/**
 * Recomputes the summary rows marked stale (new students, changed seats) before a read, so
 * every figure counts them under the rules. With none stale this is one partial-index lookup.
 */
export async function topUpAttainment(db: Database): Promise<void> {
  const stale = rowsOf<{ student_id: number }>(
    await db.execute(sql`select student_id from student_attainment where stale`),
  );
  if (stale.length === 0) return;
  await db.transaction((tx) =>
    recomputeAttainment(
      tx,
      stale.map((row) => row.student_id),
    ),
  );
}

/** The ladder context the figures read: the active version's rungs and benchmarks. */
export async function overviewLadder(db: Queryable) {
  const ladder = await activeRuleLadder(db);
  return {
    versionId: ladder?.versionId ?? null,
    rungCount: ladder?.rungs.length ?? 0,
    benchmarks: ladder?.benchmarks ?? [],
  };
}

/** `GET /api/analytics/overview`: every ladder figure of the Overview for the actor's schools. */
export async function overview(db: Database, actor: Actor, query: unknown): Promise<Overview> {
  const options = parseInput(overviewQuerySchema, query, 'The overview query');
  const filters = {
    schoolId: options.schoolId,
    grade: options.grade,
    ensembleId: options.ensembleId,
  };
  const drillFilters = { ...filters, asOf: options.asOf };
  const asOf = options.asOf ?? today();
  await topUpAttainment(db);
  const ladder = await overviewLadder(db);
  const [cells, weeks, stalled, quiet] = await Promise.all([
    rungHistogram(db, actor, filters),
    passOffsPerWeek(db, actor, filters, asOf),
    stalledStudents(db, actor, drillFilters, asOf, options.stalledDays),
    quietDirectors(db, actor, filters, asOf, options.quietDays),
  ]);
  const figures = await rungFigures(
    db,
    cells,
    ladder.rungCount,
    ladder.benchmarks,
    drillFilters,
    asOf,
  );
  return {
    asOf,
    filters: {
      schoolId: filters.schoolId ?? null,
      grade: filters.grade ?? null,
      ensembleId: filters.ensembleId ?? null,
    },
    ladderVersionId: ladder.versionId,
    rungCount: ladder.rungCount,
    ...figures,
    passOffsPerWeek: weeks,
    stalled,
    quietDirectors: quiet,
  };
}
