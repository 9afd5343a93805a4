import type { ImportResult } from '@shared/api/import';
import type { Actor } from '../core/policy';
import { afterAnswering, type DatabaseHandle } from '../db/client';
import { refreshStatistics, rosterTables, statisticsStale } from '../db/statistics';
import {
  bulkLoadAtLeast,
  dropSecondaryIndexes,
  loadsInBulk,
  skipReferenceTriggers,
} from './bulk-load';
import { applyDeltaRemovals } from './delta-removals';
import { uncommittedResult, type ImportPlan } from './import-plan';
import { endLeftSeats, journalCreated, saveJournal } from './import-journal';
import {
  createStagingTables,
  ensureEnsembles,
  insertStudents,
  planStillHolds,
  schoolsAndYear,
  seatStudents,
  stage,
  studentRows,
  updateStudents,
  withdrawMissing,
} from './import-writes';
import { inSqlTransaction, type SqlSession } from './sql-session';

/** Where an import came from, for its history row. */
export interface ImportMeta {
  fileName: string;
  via: 'wizard' | 'cli' | 'api';
}

/** What {@link commitImport} answers: the import's result and its history row. */
export type CommittedImport = ImportResult & { importId: number };

async function recordHistory(
  session: SqlSession,
  plan: ImportPlan,
  result: ImportResult,
  userId: number | null,
  meta: ImportMeta,
) {
  const [row] = await session.query<{ id: number }>(
    `insert into roster_imports (user_id, file_name, source, via, committed, rows, created, updated, unchanged, withdrawn, errors)
     values ($1::int, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11::jsonb) returning id`,
    [
      userId,
      meta.fileName,
      plan.parsed.source,
      meta.via,
      result.committed,
      result.rows,
      result.created,
      result.updated,
      result.unchanged,
      result.withdrawn,
      JSON.stringify(result.errors),
    ],
  );
  return row!.id;
}

/** The import's summarising audit entry. */
async function auditImport(
  session: SqlSession,
  importId: number,
  result: ImportResult,
  userId: number | null,
  meta: ImportMeta,
  newEnsembles: string[],
) {
  await session.query(
    `insert into audit_log (user_id, action, entity, entity_id, before, after) values ($1::int, 'import', 'roster_import', $2, null, $3::jsonb)`,
    [
      userId,
      String(importId),
      JSON.stringify({
        fileName: meta.fileName,
        via: meta.via,
        rows: result.rows,
        created: result.created,
        updated: result.updated,
        unchanged: result.unchanged,
        withdrawn: result.withdrawn,
        errors: result.errors.length,
        newEnsembles,
      }),
    ],
  );
}

/** What the statements did, row by row of the file: created, updated or unchanged. */
function countRows(
  plan: ImportPlan,
  created: Set<string>,
  updated: Set<string>,
  seatChanges: Set<string>,
  seatsLeft: Set<string>,
  seatKey: (row: ImportPlan['parsed']['rows'][number]['row']) => string,
) {
  const counts = { created: 0, updated: 0, unchanged: 0 };
  const seenStudents = new Set<string>();
  for (const { row } of plan.parsed.rows) {
    const firstRow = !seenStudents.has(row.studentId);
    seenStudents.add(row.studentId);
    if (created.has(row.studentId)) counts.created += 1;
    else if (updated.has(row.studentId)) counts.updated += 1;
    else if (row.ensemble && seatChanges.has(seatKey(row))) counts.updated += 1;
    // A seat left counts on the student's first row, as the plan counts it.
    else if (firstRow && seatsLeft.has(row.studentId)) counts.updated += 1;
    else counts.unchanged += 1;
  }
  return counts;
}

/** Writes a plan that can commit, inside its one transaction; answers the result and history row. */
async function writePlan(
  database: DatabaseHandle,
  session: SqlSession,
  plan: ImportPlan,
  userId: number | null,
  meta: ImportMeta,
  bulk: boolean,
): Promise<CommittedImport> {
  if (database.kind === 'postgres')
    await session.query(`select pg_advisory_xact_lock(hashtext('tutti roster import'))`);
  // First, before this transaction's own writes move the generation.
  const onlyDifferences = await planStillHolds(database, session, plan.differences.generation);
  const { schoolIdByCode, year } = await schoolsAndYear(session);
  const ensembles = await ensureEnsembles(session, plan, schoolIdByCode);
  if (database.kind === 'pglite') await skipReferenceTriggers(session);
  await createStagingTables(session);
  const students = await studentRows(session, plan, schoolIdByCode, onlyDifferences);
  await stage(session, plan, students, schoolIdByCode, ensembles.ensembleId, onlyDifferences);
  const updated = await updateStudents(session, plan, userId, year?.id ?? null);
  // A bulk load builds the secondary indexes again once the new students and seats are in.
  const rebuild =
    bulk && students.fresh.length >= bulkLoadAtLeast
      ? await dropSecondaryIndexes((text) => session.query(text))
      : [];
  const created = await insertStudents(session, students.fresh);
  await journalCreated(
    session,
    [...created],
    ensembles.created.map((row) => row.id),
  );
  const seatChanges = year ? await seatStudents(session, year.id) : new Set<string>();
  const seatsLeft = year ? await endLeftSeats(session, plan, year.id, userId) : new Set<string>();
  for (const definition of rebuild) await session.query(definition);
  const schoolIds = plan.schoolCodes.map((code) => schoolIdByCode.get(code)!);
  const removed = await applyDeltaRemovals(session, plan, year?.id ?? null, userId);
  const withdrawn =
    (plan.options.withdrawMissing
      ? await withdrawMissing(session, schoolIds, year?.id ?? null, userId)
      : 0) + removed.withdrawn;
  const counts = countRows(plan, created, updated, seatChanges, seatsLeft, (row) =>
    [row.studentId, ensembles.ensembleId(schoolIdByCode.get(row.schoolCode)!, row.ensemble!)].join(
      ' ',
    ),
  );
  const result: ImportResult = {
    rows: plan.counts.rows,
    ...counts,
    updated: counts.updated + removed.endedSeats,
    withdrawn,
    errors: plan.errors,
    committed: true,
  };
  const importId = await recordHistory(session, plan, result, userId, meta);
  await saveJournal(session, importId, schoolIds, year?.id ?? null);
  const newEnsembles = ensembles.created.map((row) => row.name);
  await auditImport(session, importId, result, userId, meta, newEnsembles);
  return { ...result, importId };
}

/**
 * Carries out a plan in one transaction, set-based: new students are loaded straight into
 * `students`, the rest of the rows are staged in temporary tables (COPY in PGlite, multi-row
 * INSERTs on a server), then ensembles, students, seats and withdrawals are written with a
 * handful of INSERT … SELECT and UPDATE … FROM statements that touch only rows that differ.
 * The counts come from what the statements did, so a file imported twice reports every row
 * unchanged the second time. When nothing the plan read has been written since (see
 * {@link planStillHolds}), only the students and seats the plan found different are staged, so
 * a nightly file of 20,000 rows with a few hundred changes holds the database for a fraction
 * of the time. A plan that cannot commit (errors without skip-invalid) writes only its history
 * row. Also writes one summarising audit entry, plus one per updated or withdrawn student.
 *
 * Why one transaction, however large the import: it is the only way no reader sees an import
 * before it commits and nothing is written against its students before then, with no reader
 * changed. New students landed ahead in slices (as imports once did, to keep each hold of the
 * embedded engine short) are seen by every query of `students`, by the per-school counts and
 * the Overview's summaries their triggers keep, and by every form that records a pass-off, a
 * loan or a seat; hiding them takes a filter in each of those readers. A status column flipped
 * at the end costs an UPDATE of every landed row, as much as inserting them (every index of
 * `students` holds the row); a staging table moved in at the end costs the same insert. So the
 * engine is held once, for the whole write: about 2.5 s for 18,000 new students into a roster
 * of 50,000, the rare import that adds a school's roster (a nightly file writes only its
 * differences, a first import loads in bulk). Pages asked for meanwhile wait that long once;
 * `npm run bench` section 4 measures them against a run without the import.
 */
export async function commitImport(
  database: DatabaseHandle,
  plan: ImportPlan,
  actor: Actor | null,
  meta: ImportMeta,
): Promise<CommittedImport> {
  const userId = actor?.userId ?? null;
  const bulk = await loadsInBulk(database, plan);
  const committed = await inSqlTransaction(database, async (session) => {
    if (plan.canCommit) return writePlan(database, session, plan, userId, meta, bulk);
    const result = uncommittedResult(plan);
    return { ...result, importId: await recordHistory(session, plan, result, userId, meta) };
  });
  // A big change moves the planner's picture of the roster (see refreshStatistics): gathered
  // again once the import has answered, so no one waits for it (about 0.15 s for 18,000 new
  // students here); pages asked for meanwhile are planned with the old picture.
  const changed = committed.created + committed.updated + committed.withdrawn;
  if (committed.committed && changed > 0) {
    afterAnswering(database, 'Gathering the roster statistics after an import', async () => {
      if (await statisticsStale(database.db, 'students', changed))
        await refreshStatistics(database.db, rosterTables);
    });
  }
  return committed;
}
