import { and, eq } from 'drizzle-orm';
import type { GridPreference, GridState } from '@shared/api/grid-preference';
import type { Database } from '../db/client';
import { gridPreferences } from '../db/schema/index';
import { recordAudit } from '../core/audit';
import type { Actor } from '../core/policy';

const mine = (actor: Actor, grid: string) =>
  and(eq(gridPreferences.userId, actor.userId), eq(gridPreferences.grid, grid));

/** The signed-in user's remembered layout of one grid; `state` is null when none is kept. */
export async function getGridPreference(
  db: Database,
  actor: Actor,
  grid: string,
): Promise<GridPreference> {
  const [row] = await db.select().from(gridPreferences).where(mine(actor, grid));
  return {
    grid,
    state: (row?.state as GridState | undefined) ?? null,
    updatedAt: row ? row.updatedAt.toISOString() : null,
  };
}

/** Keeps the signed-in user's layout of one grid, replacing the one kept before. */
export async function saveGridPreference(
  db: Database,
  actor: Actor,
  grid: string,
  state: GridState,
): Promise<GridPreference> {
  const row = await db.transaction(async (tx) => {
    const [before] = await tx.select().from(gridPreferences).where(mine(actor, grid));
    const [after] = await tx
      .insert(gridPreferences)
      .values({ userId: actor.userId, grid, state })
      .onConflictDoUpdate({
        target: [gridPreferences.userId, gridPreferences.grid],
        set: { state, updatedAt: new Date() },
      })
      .returning();
    await recordAudit(tx, actor, {
      action: before ? 'update' : 'create',
      entity: 'grid-preference',
      entityId: `${actor.userId}:${grid}`,
      before,
      after,
    });
    return after!;
  });
  return { grid, state: row.state as GridState, updatedAt: row.updatedAt.toISOString() };
}

/** Forgets the signed-in user's layout of one grid, so it opens with the default columns. */
export async function clearGridPreference(db: Database, actor: Actor, grid: string) {
  await db.transaction(async (tx) => {
    const [before] = await tx.delete(gridPreferences).where(mine(actor, grid)).returning();
    if (!before) return;
    await recordAudit(tx, actor, {
      action: 'delete',
      entity: 'grid-preference',
      entityId: `${actor.userId}:${grid}`,
      before,
    });
  });
}
