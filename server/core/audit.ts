import type { Database, Transaction } from '../db/client';
import { auditLog } from '../db/schema/index';
import type { Actor } from './policy';

/** One change for the audit log. */
export interface AuditEntry {
  action: 'create' | 'update' | 'delete' | 'import' | 'sign-in' | 'move' | string;
  entity: string;
  entityId: string | number;
  before?: unknown;
  after?: unknown;
}

/** Writes who changed what, with the row before and after, in the caller's transaction. */
export async function recordAudit(
  db: Database | Transaction,
  actor: Actor | null,
  ...entries: AuditEntry[]
) {
  if (entries.length === 0) return;
  await db.insert(auditLog).values(
    entries.map((entry) => ({
      userId: actor?.userId ?? null,
      action: entry.action,
      entity: entry.entity,
      entityId: String(entry.entityId),
      before: entry.before ?? null,
      after: entry.after ?? null,
    })),
  );
}
