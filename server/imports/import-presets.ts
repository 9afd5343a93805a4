import { asc, eq, and, count } from 'drizzle-orm';
import type { ImportPreset, ImportPresetInput } from '@shared/api/import';
import type { ListResponse } from '@shared/api/list';
import type { ColumnMapping } from '@shared/roster';
import { recordAudit } from '../core/audit';
import { notFound } from '../core/errors';
import type { Actor } from '../core/policy';
import type { Database } from '../db/client';
import { importPresets } from '../db/schema/index';

const rosterKind = 'roster';

function toPreset(row: typeof importPresets.$inferSelect): ImportPreset {
  return {
    id: row.id,
    name: row.name,
    mapping: row.mapping as ColumnMapping,
    updatedAt: row.updatedAt.toISOString(),
  };
}

/** The saved roster mappings, by name. */
export async function listPresets(db: Database): Promise<ListResponse<ImportPreset>> {
  const where = eq(importPresets.kind, rosterKind);
  const [rows, [total]] = await Promise.all([
    db
      .select()
      .from(importPresets)
      .where(where)
      .orderBy(asc(importPresets.name), asc(importPresets.id)),
    db.select({ total: count() }).from(importPresets).where(where),
  ]);
  return { rows: rows.map(toPreset), total: total!.total };
}

/** Saves a mapping under a name, replacing the preset of that name when there is one. */
export async function savePreset(
  db: Database,
  actor: Actor,
  input: ImportPresetInput,
): Promise<ImportPreset> {
  return db.transaction(async (tx) => {
    const [before] = await tx
      .select()
      .from(importPresets)
      .where(and(eq(importPresets.kind, rosterKind), eq(importPresets.name, input.name)));
    const [row] = await tx
      .insert(importPresets)
      .values({ name: input.name, kind: rosterKind, mapping: input.mapping })
      .onConflictDoUpdate({
        target: [importPresets.kind, importPresets.name],
        set: { mapping: input.mapping, updatedAt: new Date() },
      })
      .returning();
    await recordAudit(tx, actor, {
      action: before ? 'update' : 'create',
      entity: 'import_preset',
      entityId: row!.id,
      before,
      after: row,
    });
    return toPreset(row!);
  });
}

/** Removes a saved mapping. */
export async function deletePreset(db: Database, actor: Actor, id: number): Promise<void> {
  await db.transaction(async (tx) => {
    const [before] = await tx
      .delete(importPresets)
      .where(and(eq(importPresets.id, id), eq(importPresets.kind, rosterKind)))
      .returning();
    if (!before) throw notFound('That preset');
    await recordAudit(tx, actor, {
      action: 'delete',
      entity: 'import_preset',
      entityId: id,
      before,
    });
  });
}
