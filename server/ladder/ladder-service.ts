import { and, count, eq, ne } from 'drizzle-orm';
import { demoLadderRungs as starterLadderRungs } from '../seed/demo-ladder-rungs';
import { z } from 'zod';
import type { Database } from '../db/client';
import { ladderVersions } from '../db/schema/index';
import {
  ladderVersionStatuses,
  type Ladder,
  type LadderDraftInput,
  draftNameMark,
  type LadderPatch,
  type LadderPublishInput,
  type LadderVersionSummary,
} from '@shared/api/ladder';
import type { ListResponse } from '@shared/api/list';
import { listPage, matchesText, orderFor, parseListQuery } from '../core/list-query';
import { can, type Actor } from '../core/policy';
import { recordAudit } from '../core/audit';
import { badRequest, conflict, notFound } from '../core/errors';
import { assertImpactSeen } from './ladder-impact';
import { createThenRead, insertAudited, updateVersioned } from '../core/versioned-update';
import { rebuildAttainment } from './attainment';
import { refreshStatistics, summaryTables } from '../db/statistics';
import {
  activeVersionId,
  loadLadder,
  toVersionSummary,
  selectVersionSummaries,
  writeLadderContent,
} from './ladder-queries';

/** The active ladder with its rungs, requirements and benchmarks; 404 when none is published. */
export async function getActiveLadder(db: Database): Promise<Ladder> {
  const id = await activeVersionId(db);
  if (id === null) throw notFound('A published scale ladder');
  return loadLadder(db, id);
}

const versionFilters = z.object({ status: z.enum(ladderVersionStatuses).optional() });
const versionSortable = {
  name: ladderVersions.name,
  status: ladderVersions.status,
  createdAt: ladderVersions.createdAt,
  publishedAt: ladderVersions.publishedAt,
};

/** The versions, newest first unless sorted; drafts only for those who may edit the ladder. */
export async function listVersions(
  db: Database,
  actor: Actor,
  query: unknown,
): Promise<ListResponse<LadderVersionSummary>> {
  const list = parseListQuery(query, versionFilters);
  const where = and(
    can(actor, 'ladder:write') ? undefined : ne(ladderVersions.status, 'draft'),
    list.status ? eq(ladderVersions.status, list.status) : undefined,
    matchesText(list.q, [ladderVersions.name]),
  );
  return listPage(
    list,
    orderFor(list.sort, versionSortable, 'createdAt:desc', ladderVersions.id),
    selectVersionSummaries(db).where(where).$dynamic(),
    db.select({ total: count() }).from(ladderVersions).where(where),
    toVersionSummary,
  );
}

/** One version; a draft is 404 for those who may not edit the ladder. */
export async function getVersion(db: Database, actor: Actor, id: number): Promise<Ladder> {
  const ladder = await loadLadder(db, id);
  if (ladder.status === 'draft' && !can(actor, 'ladder:write'))
    throw notFound('That ladder version');
  return ladder;
}

/** A new draft, copied from the active version (or empty when there is none yet). */
export async function createDraft(
  db: Database,
  actor: Actor,
  input: LadderDraftInput,
): Promise<Ladder> {
  const sourceId = input.starter ? null : await activeVersionId(db);
  const source = input.starter
    ? { name: 'Starter scale ladder', rungs: starterLadderRungs, benchmarks: [] }
    : sourceId === null
      ? null
      : await loadLadder(db, sourceId);
  return createThenRead(
    db,
    async (tx) => {
      const row = await insertAudited(
        tx,
        actor,
        ladderVersions,
        {
          name: input.name ?? (source ? `${source.name} (draft)` : 'Scale ladder'),
          status: 'draft',
          createdBy: actor.userId,
        },
        'ladder-version',
        (stored) => ({ ...stored, copiedFrom: input.starter ? 'starter' : sourceId }),
      );
      if (source) await writeLadderContent(tx, row.id, source);
      return row;
    },
    (id) => loadLadder(db, id),
  );
}

/** Changes a draft: its name, and its rungs and benchmarks replaced whole. */
export async function updateDraft(
  db: Database,
  actor: Actor,
  id: number,
  patch: LadderPatch,
): Promise<Ladder> {
  const before = await loadLadder(db, id);
  if (before.status !== 'draft') {
    throw conflict(
      'A published ladder version does not change: make a new draft from it, edit that, and publish it.',
    );
  }
  await db.transaction(async (tx) => {
    await updateVersioned(
      tx,
      ladderVersions,
      id,
      patch.version,
      patch.name === undefined ? {} : { name: patch.name },
      'That ladder version',
    );
    await writeLadderContent(tx, id, patch);
    await recordAudit(tx, actor, {
      action: 'update',
      entity: 'ladder-version',
      entityId: id,
      before,
      after: { name: patch.name, rungs: patch.rungs, benchmarks: patch.benchmarks },
    });
  });
  return loadLadder(db, id);
}

/** Throws a draft away; published and archived versions stay, since pass-offs name them. */
export async function deleteDraft(db: Database, actor: Actor, id: number): Promise<void> {
  const before = await loadLadder(db, id);
  if (before.status !== 'draft')
    throw conflict(
      'Only a draft can be deleted; published versions are kept for the pass-offs heard under them.',
    );
  await db.transaction(async (tx) => {
    await tx
      .delete(ladderVersions)
      .where(and(eq(ladderVersions.id, id), eq(ladderVersions.status, 'draft')));
    await recordAudit(tx, actor, {
      action: 'delete',
      entity: 'ladder-version',
      entityId: id,
      before,
    });
  });
}

/**
 * Publishes a draft under a name of its own, once its impact has been seen: it becomes the
 * active version, the one it replaces is archived, and every student's rung is recomputed
 * against it in the same transaction.
 */
export async function publishVersion(
  db: Database,
  actor: Actor,
  id: number,
  input: LadderPublishInput,
): Promise<Ladder> {
  const draft = await loadLadder(db, id);
  if (draft.status !== 'draft')
    throw conflict('Only a draft can be published; this version already was.');
  const name = input.name ?? draft.name;
  if (draftNameMark.test(name))
    throw badRequest('Give the version a name of its own before publishing it.', [
      { field: 'name', message: 'A published version takes a name of its own, without “(draft)”.' },
    ]);
  await putInForce(db, actor, draft, input.impactToken, {
    action: 'publish',
    set: { status: 'published', name, publishedAt: new Date() },
    from: 'draft',
  });
  return loadLadder(db, id);
}

/**
 * Puts an earlier published version back in force (a roll-back), once its impact has been
 * seen; the version it replaces is archived and can be put back the same way.
 */
export async function restoreVersion(
  db: Database,
  actor: Actor,
  id: number,
  input: LadderPublishInput,
): Promise<Ladder> {
  const earlier = await loadLadder(db, id);
  if (earlier.status !== 'archived' || earlier.publishedAt === null)
    throw conflict('Only a version that was in force before can be put back in force.');
  await putInForce(db, actor, earlier, input.impactToken, {
    action: 'restore',
    set: { status: 'published' },
    from: 'archived',
  });
  return loadLadder(db, id);
}

async function putInForce(
  db: Database,
  actor: Actor,
  candidate: Ladder,
  impactToken: string,
  change: {
    action: 'publish' | 'restore';
    set: Partial<typeof ladderVersions.$inferInsert>;
    from: 'draft' | 'archived';
  },
): Promise<void> {
  await db.transaction(async (tx) => {
    await assertImpactSeen(tx, candidate, impactToken);
    const replaced = await tx
      .update(ladderVersions)
      .set({ active: false, status: 'archived', updatedAt: new Date() })
      .where(and(eq(ladderVersions.active, true), ne(ladderVersions.id, candidate.id)))
      .returning({ id: ladderVersions.id });
    const published = await tx
      .update(ladderVersions)
      .set({ ...change.set, active: true, updatedAt: new Date() })
      .where(and(eq(ladderVersions.id, candidate.id), eq(ladderVersions.status, change.from)))
      .returning({ id: ladderVersions.id });
    if (published.length === 0)
      throw conflict('Someone else published or changed this version first.');
    await rebuildAttainment(tx, { from: 'summaries' });
    await recordAudit(tx, actor, {
      action: change.action,
      entity: 'ladder-version',
      entityId: candidate.id,
      before: { archived: replaced.map((row) => row.id) },
      after: { active: candidate.id, ...(change.set.name ? { name: change.set.name } : {}) },
    });
  });
  await refreshStatistics(db, summaryTables);
}
