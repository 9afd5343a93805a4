import { and, eq, lt, sql } from 'drizzle-orm';
import type { Database } from '../db/client';
import { instruments, loans, schools, students } from '../db/schema/index';
import type { ReminderResult } from '@shared/api/loan';
import { assertInScope, type Actor } from '../core/policy';
import { recordAudit } from '../core/audit';
import { loanColumns, loanScope, findLoanRow, type LoanRow } from './loans-queries';
import { queueReminderMail } from './loan-mail';
import { stateConflict } from '../instruments/instruments-service';
import { todayIso } from './school-calendar';

// A guardian hears about one overdue loan at most once in this many hours from the batch run.
const batchQuietHours = 20;

/** E-mails the guardian of one active loan that it is due (or overdue). */
export async function remindOne(db: Database, actor: Actor, id: number): Promise<ReminderResult> {
  const row = await findLoanRow(db, actor, id);
  if (row.loan.state !== 'active')
    throw stateConflict('This loan has ended; there is nothing to remind about.');
  const overdue = row.loan.dueOn < todayIso();
  const queued = await db.transaction(async (tx) => {
    const sent = await queueReminderMail(tx, row, overdue, actor.userId);
    if (sent) await recordAudit(tx, actor, { action: 'reminder', entity: 'loan', entityId: id });
    return sent;
  });
  return { queued: queued ? 1 : 0 };
}

/**
 * E-mails the guardians of every overdue loan the actor acts for (or of one school), skipping
 * loans reminded in the last hours so that a second click sends nothing twice.
 */
export async function remindOverdue(
  db: Database,
  actor: Actor,
  schoolId?: number,
): Promise<ReminderResult> {
  if (schoolId !== undefined) assertInScope(actor, schoolId, 'That school');
  const recentlyReminded = sql`exists (select 1 from outbox_messages m where m.related_type = 'loan' and m.related_id = "loans"."id" and m.kind = 'overdue-reminder' and m.created_at > now() - make_interval(hours => ${batchQuietHours}))`;
  const rows: LoanRow[] = await db
    .select(loanColumns)
    .from(loans)
    .innerJoin(instruments, eq(instruments.id, loans.instrumentId))
    .innerJoin(students, eq(students.id, loans.studentId))
    .innerJoin(schools, eq(schools.id, loans.schoolId))
    .where(
      and(
        loanScope(actor),
        eq(loans.state, 'active'),
        lt(loans.dueOn, todayIso()),
        schoolId === undefined ? undefined : eq(loans.schoolId, schoolId),
        sql`not ${recentlyReminded}`,
      ),
    );
  let queued = 0;
  await db.transaction(async (tx) => {
    for (const row of rows) if (await queueReminderMail(tx, row, true, actor.userId)) queued += 1;
    if (queued) {
      await recordAudit(tx, actor, {
        action: 'reminder',
        entity: 'loan',
        entityId: 'overdue-batch',
        after: { queued, loanIds: rows.map((row) => row.loan.id) },
      });
    }
  });
  return { queued };
}
