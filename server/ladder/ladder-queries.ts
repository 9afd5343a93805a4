import { asc, eq, sql } from 'drizzle-orm';
import type { Database, Transaction } from '../db/client';
import {
  ladderBenchmarks,
  ladderRequirements,
  ladderRungs,
  ladderVersions,
  users,
} from '../db/schema/index';
import type { Ladder, LadderBenchmark, LadderRung, LadderVersionSummary } from '@shared/api/ladder';
import type { Requirement, Rung } from '@shared/ladder/index';
import type { Articulation, Mode, PatternId } from '@shared/music/index';
import { notFound } from '../core/errors';

/** A database or an open transaction. */
export type Queryable = Database | Transaction;

type RequirementRow = typeof ladderRequirements.$inferSelect;

const requirementCount = sql<number>`(select count(*)::int from ladder_requirements lr where lr.ladder_version_id = "ladder_versions"."id")`;
const rungCount = sql<number>`(select count(*)::int from ladder_rungs lg where lg.ladder_version_id = "ladder_versions"."id")`;

/** The columns of a version's heading. */
export const versionSummaryColumns = {
  id: ladderVersions.id,
  name: ladderVersions.name,
  status: ladderVersions.status,
  active: ladderVersions.active,
  createdAt: ladderVersions.createdAt,
  publishedAt: ladderVersions.publishedAt,
  createdByName: users.name,
  rungCount,
  requirementCount,
  version: ladderVersions.version,
};

type SummaryRow = {
  id: number;
  name: string;
  status: 'draft' | 'published' | 'archived';
  active: boolean;
  createdAt: Date;
  publishedAt: Date | null;
  createdByName: string | null;
  rungCount: number;
  requirementCount: number;
  version: number;
};

/** A version heading row as the API answers it. */
export function toVersionSummary(row: SummaryRow): LadderVersionSummary {
  return {
    ...row,
    createdAt: row.createdAt.toISOString(),
    publishedAt: row.publishedAt?.toISOString() ?? null,
  };
}

/** The id of the active ladder version, or null when none has been published. */
export async function activeVersionId(db: Queryable): Promise<number | null> {
  const [row] = await db
    .select({ id: ladderVersions.id })
    .from(ladderVersions)
    .where(eq(ladderVersions.active, true));
  return row?.id ?? null;
}

function toApiRequirement(row: RequirementRow) {
  return {
    code: row.code,
    tonic: row.tonic,
    mode: row.mode as Mode,
    pattern: row.pattern as PatternId,
    tempo: row.tempo,
    articulation: row.articulation as Articulation,
    octaves: row.octaves as 1 | 2,
    optional: row.optional,
    families: (row.families ?? null) as LadderRung['requirements'][number]['families'],
  };
}

/** A version's rungs with their requirements (API shape), in ladder order. */
export async function loadRungs(db: Queryable, versionId: number): Promise<LadderRung[]> {
  // One after the other: `db` may be a transaction, one connection that runs one query at a
  // time (node-postgres deprecates queuing a second query on a busy client).
  const rungRows = await db
    .select()
    .from(ladderRungs)
    .where(eq(ladderRungs.ladderVersionId, versionId))
    .orderBy(asc(ladderRungs.number));
  const requirementRows = await db
    .select()
    .from(ladderRequirements)
    .where(eq(ladderRequirements.ladderVersionId, versionId))
    .orderBy(asc(ladderRequirements.position), asc(ladderRequirements.id));
  return rungRows.map((rung) => ({
    number: rung.number,
    title: rung.title,
    requirements: requirementRows.filter((row) => row.rungId === rung.id).map(toApiRequirement),
  }));
}

/** A version's benchmarks, by grade then date. */
export async function loadBenchmarks(db: Queryable, versionId: number): Promise<LadderBenchmark[]> {
  return db
    .select({
      grade: ladderBenchmarks.grade,
      rung: ladderBenchmarks.rung,
      byDate: ladderBenchmarks.byDate,
    })
    .from(ladderBenchmarks)
    .where(eq(ladderBenchmarks.ladderVersionId, versionId))
    .orderBy(asc(ladderBenchmarks.grade), asc(ladderBenchmarks.byDate));
}

/** The API's rungs in the form the ladder rules take (a requirement's id is its code). */
export function toRuleRungs(rungs: readonly LadderRung[]): Rung[] {
  return rungs.map((rung) => ({
    number: rung.number,
    title: rung.title,
    requirements: rung.requirements.map((requirement): Requirement => ({
      id: requirement.code,
      key: { tonic: requirement.tonic, mode: requirement.mode },
      pattern: requirement.pattern,
      tempo: requirement.tempo,
      articulation: requirement.articulation,
      octaves: requirement.octaves,
      optional: requirement.optional,
      ...(requirement.families ? { families: [...requirement.families] } : {}),
    })),
  }));
}

/** The ladder versions with who made them, selecting {@link versionSummaryColumns}. */
export function selectVersionSummaries(db: Queryable) {
  return db
    .select(versionSummaryColumns)
    .from(ladderVersions)
    .leftJoin(users, eq(users.id, ladderVersions.createdBy));
}

/** One ladder version with everything in it; 404 when unknown. */
export async function loadLadder(db: Queryable, versionId: number): Promise<Ladder> {
  const [summary] = await selectVersionSummaries(db).where(eq(ladderVersions.id, versionId));
  if (!summary) throw notFound('That ladder version');
  const rungs = await loadRungs(db, versionId);
  const benchmarks = await loadBenchmarks(db, versionId);
  return { ...toVersionSummary(summary as SummaryRow), rungs, benchmarks };
}

/** The active ladder in the rules' form, with its id; null when none is published. */
export async function activeRuleLadder(db: Queryable): Promise<{
  versionId: number;
  name: string;
  rungs: Rung[];
  apiRungs: LadderRung[];
  benchmarks: LadderBenchmark[];
} | null> {
  const [row] = await db
    .select({ id: ladderVersions.id, name: ladderVersions.name })
    .from(ladderVersions)
    .where(eq(ladderVersions.active, true));
  if (!row) return null;
  const apiRungs = await loadRungs(db, row.id);
  const benchmarks = await loadBenchmarks(db, row.id);
  return { versionId: row.id, name: row.name, rungs: toRuleRungs(apiRungs), apiRungs, benchmarks };
}

/** Replaces a version's rungs, requirements and benchmarks (inside the caller's transaction). */
export async function writeLadderContent(
  tx: Transaction,
  versionId: number,
  content: { rungs?: readonly LadderRung[]; benchmarks?: readonly LadderBenchmark[] },
): Promise<void> {
  if (content.rungs) {
    await tx.delete(ladderRungs).where(eq(ladderRungs.ladderVersionId, versionId));
    if (content.rungs.length) {
      const inserted = await tx
        .insert(ladderRungs)
        .values(
          content.rungs.map((rung) => ({
            ladderVersionId: versionId,
            number: rung.number,
            title: rung.title,
          })),
        )
        .returning({ id: ladderRungs.id, number: ladderRungs.number });
      const rungIds = new Map(inserted.map((row) => [row.number, row.id]));
      const requirements = content.rungs.flatMap((rung) =>
        rung.requirements.map((requirement, position) => ({
          ladderVersionId: versionId,
          rungId: rungIds.get(rung.number)!,
          position,
          code: requirement.code,
          tonic: requirement.tonic,
          mode: requirement.mode,
          pattern: requirement.pattern,
          tempo: requirement.tempo,
          articulation: requirement.articulation,
          octaves: requirement.octaves,
          optional: requirement.optional,
          families: requirement.families ? [...requirement.families] : null,
        })),
      );
      if (requirements.length) await tx.insert(ladderRequirements).values(requirements);
    }
  }
  if (content.benchmarks) {
    await tx.delete(ladderBenchmarks).where(eq(ladderBenchmarks.ladderVersionId, versionId));
    if (content.benchmarks.length) {
      await tx
        .insert(ladderBenchmarks)
        .values(
          content.benchmarks.map((benchmark) => ({ ladderVersionId: versionId, ...benchmark })),
        );
    }
  }
}
