import { assertWaiverReason, computeLoanFee } from '../payments/fee-schedule';
import { and, eq, sql } from 'drizzle-orm';
import type { Database, Transaction } from '../db/client';
import { instruments, loans, repairTickets, students } from '../db/schema/index';
import type { CheckoutInput, Loan, ReturnInput } from '@shared/api/loan';
import { assertInScope, inScope, type Actor } from '../core/policy';
import { recordAudit } from '../core/audit';
import { badRequest, notFound } from '../core/errors';
import { recordInstrumentEvents } from '../instruments/instrument-events';
import { setInstrumentStatus, stateConflict } from '../instruments/instruments-service';
import { isWindInstrument } from '../instruments/instrument-cautions';
import { defaultDueDate, todayIso } from './school-calendar';
import { findLoan, findLoanRow, type LoanRow } from './loans-queries';
import { agreementLinkColumns } from './agreement-text';
import { queueAgreementMail } from './loan-mail';

const statusWords: Record<string, string> = {
  'on-loan': 'already out on loan',
  'in-repair': 'in repair',
  'to-clean': 'waiting to be cleaned and sanitised after its last loan; mark it cleaned first',
  missing: 'marked missing',
  retired: 'retired from the fleet',
};

/** Whether an error is PostgreSQL's unique violation (23505) on the named index. */
function isUniqueViolation(error: unknown, constraint: string): boolean {
  for (
    let current = error as { code?: string; constraint?: string; cause?: unknown } | undefined;
    current;
    current = current.cause as typeof current
  ) {
    if (current.code === '23505') return !current.constraint || current.constraint === constraint;
  }
  return false;
}

/** The address of a signing link. */
export function agreementLink(appUrl: string, token: string): string {
  return `${appUrl}/agreements/${token}`;
}

type StudentRow = typeof students.$inferSelect;
type InstrumentRow = typeof instruments.$inferSelect;

/** The student and the instrument a checkout names, both in the caller's schools. */
async function checkoutParties(
  db: Database,
  actor: Actor,
  input: CheckoutInput,
): Promise<{ student: StudentRow; instrument: InstrumentRow }> {
  const [student] = await db.select().from(students).where(eq(students.id, input.studentId));
  if (!student || !inScope(actor, student.schoolId)) throw notFound('That student');
  if (student.status !== 'active')
    throw stateConflict('That student has withdrawn; only active students borrow instruments.');
  const [instrument] = await db
    .select()
    .from(instruments)
    .where(eq(instruments.id, input.instrumentId));
  if (!instrument) throw notFound('That instrument');
  assertInScope(actor, instrument.homeSchoolId, 'That instrument');
  return { student, instrument };
}

/** The loan's waiver, due date and fee, checked. */
async function checkoutTerms(
  db: Database,
  input: CheckoutInput,
  student: StudentRow,
  instrument: InstrumentRow,
): Promise<{ today: string; dueOn: string; feeCents: number }> {
  if (input.waiverReason && !input.waiver) {
    throw badRequest('A waiver reason needs the waiver itself.', [
      { field: 'waiverReason', message: 'Tick the waiver, or leave the reason empty.' },
    ]);
  }
  await assertWaiverReason(db, input);
  const dueOn = input.dueOn ?? (await defaultDueDate(db));
  const today = todayIso();
  if (dueOn < today)
    throw badRequest('The due date is in the past.', [
      { field: 'dueOn', message: 'Pick a day from today on.' },
    ]);
  // The fee comes from the district's schedule; a hand-entered one only where it has no entry.
  const scheduled = await computeLoanFee(db, instrument.instrumentId, student, today);
  return { today, dueOn, feeCents: scheduled.feeCents ?? input.usageFeeCents };
}

/** Flips an available instrument to `on-loan`; any other status is a 409 naming it. */
async function claimInstrument(tx: Transaction, instrument: InstrumentRow): Promise<void> {
  const claimed = await tx
    .update(instruments)
    .set({ status: 'on-loan', version: sql`${instruments.version} + 1`, updatedAt: new Date() })
    .where(and(eq(instruments.id, instrument.id), eq(instruments.status, 'available')))
    .returning({ id: instruments.id });
  if (claimed.length === 0) {
    const [now] = await tx
      .select({ status: instruments.status })
      .from(instruments)
      .where(eq(instruments.id, instrument.id));
    throw stateConflict(
      `${instrument.assetTag} cannot be lent: it is ${statusWords[now!.status] ?? now!.status}.`,
    );
  }
}

/**
 * Checks an instrument out to a student. Only an `available` instrument may go out: the status
 * flips in the same transaction as the loan is written, and the partial unique index on active
 * loans makes sure two checkouts racing for one instrument cannot both commit (the loser is 409).
 * A one-time agreement link is e-mailed to the guardian through the outbox.
 */
export async function checkOut(
  db: Database,
  appUrl: string,
  actor: Actor,
  input: CheckoutInput,
  /** With online payments: each loan's pay-link token, for the agreement e-mail. */
  payToken?: (loanId: number) => string,
): Promise<Loan> {
  const { student, instrument } = await checkoutParties(db, actor, input);
  const { today, dueOn, feeCents } = await checkoutTerms(db, input, student, instrument);
  const { token, columns } = agreementLinkColumns();
  let loanId: number;
  try {
    loanId = await db.transaction(async (tx) => {
      await claimInstrument(tx, instrument);
      const [loan] = await tx
        .insert(loans)
        .values({
          instrumentId: instrument.id,
          studentId: student.id,
          schoolId: student.schoolId,
          checkedOutOn: today,
          dueOn,
          accessories: input.accessories,
          conditionOut: input.conditionOut,
          usageFeeCents: input.waiver ? 0 : feeCents,
          waiver: input.waiver,
          waiverReason: input.waiver ? (input.waiverReason ?? null) : null,
          checkedOutBy: actor.userId,
          ...columns,
        })
        .returning();
      if (input.conditionOut !== instrument.condition) {
        await tx
          .update(instruments)
          .set({ condition: input.conditionOut })
          .where(eq(instruments.id, instrument.id));
      }
      await recordInstrumentEvents(tx, {
        instrumentId: instrument.id,
        kind: 'loan-out',
        note: `Lent to student ${student.studentNumber}, due ${dueOn}`,
        userId: actor.userId,
        loanId: loan!.id,
      });
      await recordAudit(tx, actor, {
        action: 'create',
        entity: 'loan',
        entityId: loan!.id,
        after: { ...loan, agreementTokenHash: undefined },
      });
      const row = await findLoanRow(tx, null, loan!.id);
      await queueAgreementMail(
        tx,
        row,
        agreementLink(appUrl, token),
        columns.agreementExpiresAt,
        actor.userId,
        payToken && loan!.usageFeeCents > 0 ? `${appUrl}/pay/${payToken(loan!.id)}` : undefined,
      );
      return loan!.id;
    });
  } catch (error) {
    if (isUniqueViolation(error, 'loans_one_active_per_instrument')) {
      throw stateConflict(`${instrument.assetTag} cannot be lent: it is already out on loan.`);
    }
    throw error;
  }
  return findLoan(db, actor, loanId);
}

/** A return must be of an active loan, and say the condition unless the instrument is lost. */
function assertReturnable(row: LoanRow, input: ReturnInput): void {
  if (row.loan.state !== 'active')
    throw stateConflict(
      `This loan is already ${row.loan.state}; only an instrument that is out can be returned.`,
    );
  if (!input.lost && !input.conditionIn) {
    throw badRequest('Say what condition the instrument came back in.', [
      { field: 'conditionIn', message: 'Pick a condition.' },
    ]);
  }
  if (input.lost && input.damaged)
    throw badRequest('A lost instrument cannot also come back damaged.', [
      { field: 'lost', message: 'Pick one.' },
    ]);
}

/**
 * Where the instrument goes after a return that is not a loss, with its history: damage opens a
 * repair ticket (in repair); a wind instrument waits to be cleaned; anything else is available.
 */
async function receiveInstrument(
  tx: Transaction,
  actor: Actor,
  row: LoanRow,
  input: ReturnInput,
  notes: string,
): Promise<void> {
  const instrumentId = row.loan.instrumentId;
  const base = { instrumentId, userId: actor.userId, loanId: row.loan.id };
  const [instrument] = await tx.select().from(instruments).where(eq(instruments.id, instrumentId));
  await recordInstrumentEvents(tx, {
    ...base,
    kind: 'return',
    note: `Returned in ${input.conditionIn} condition${notes}`,
  });
  if (input.conditionIn !== instrument!.condition) {
    await recordInstrumentEvents(tx, {
      ...base,
      kind: 'condition-change',
      note: `Condition ${instrument!.condition} → ${input.conditionIn}`,
    });
  }
  if (input.damaged) {
    const [ticket] = await tx
      .insert(repairTickets)
      .values({
        instrumentId,
        problem: input.damaged.problem,
        reportedBy: actor.userId,
        inHouse: true,
        loanId: row.loan.id,
      })
      .returning({ id: repairTickets.id });
    await setInstrumentStatus(tx, instrumentId, 'in-repair', input.conditionIn);
    await recordInstrumentEvents(tx, {
      ...base,
      kind: 'repair-open',
      note: input.damaged.problem,
      repairId: ticket!.id,
    });
  } else {
    await setInstrumentStatus(
      tx,
      instrumentId,
      isWindInstrument(row.instrumentType) ? 'to-clean' : 'available',
      input.conditionIn,
    );
  }
}

/**
 * Takes a loan back. Damage opens a repair ticket (instrument in repair); a loss keeps the loan as
 * `lost` and marks the instrument missing; a wind instrument otherwise waits to be cleaned and
 * sanitised (`to-clean`) before it can go out again.
 */
export async function returnLoan(
  db: Database,
  actor: Actor,
  id: number,
  input: ReturnInput,
): Promise<Loan> {
  const row = await findLoanRow(db, actor, id);
  assertReturnable(row, input);
  const instrumentId = row.loan.instrumentId;
  await db.transaction(async (tx) => {
    const ended = await tx
      .update(loans)
      .set({
        state: input.lost ? 'lost' : 'returned',
        returnedOn: input.lost ? null : todayIso(),
        conditionIn: input.conditionIn ?? null,
        version: sql`${loans.version} + 1`,
        updatedAt: new Date(),
      })
      .where(and(eq(loans.id, id), eq(loans.state, 'active')))
      .returning({ id: loans.id });
    if (ended.length === 0)
      throw stateConflict('This loan was returned a moment ago by someone else.');
    const notes = input.notes ? ` — ${input.notes}` : '';
    if (input.lost) {
      await setInstrumentStatus(tx, instrumentId, 'missing');
      await recordInstrumentEvents(tx, {
        instrumentId,
        userId: actor.userId,
        loanId: id,
        kind: 'marked-missing',
        note: `Reported lost on loan${notes}`,
      });
    } else {
      await receiveInstrument(tx, actor, row, input, notes);
    }
    await recordAudit(tx, actor, {
      action: input.lost ? 'lost' : 'return',
      entity: 'loan',
      entityId: id,
      before: { state: 'active' },
      after: input,
    });
  });
  return findLoan(db, actor, id);
}

/** Sends the guardian a fresh signing link (the old one stops working). */
export async function resendAgreementLink(
  db: Database,
  appUrl: string,
  actor: Actor,
  id: number,
): Promise<Loan> {
  const row = await findLoanRow(db, actor, id);
  if (row.loan.signedAt) throw stateConflict('The guardian has already signed this agreement.');
  if (row.loan.state !== 'active')
    throw stateConflict('This loan has ended; there is nothing left to sign.');
  if (!row.guardianEmail)
    throw badRequest('This student has no guardian e-mail on the roster; add one first.');
  const { token, columns } = agreementLinkColumns();
  await db.transaction(async (tx) => {
    await tx
      .update(loans)
      .set({ ...columns, updatedAt: new Date() })
      .where(eq(loans.id, id));
    await queueAgreementMail(
      tx,
      row,
      agreementLink(appUrl, token),
      columns.agreementExpiresAt,
      actor.userId,
    );
    await recordAudit(tx, actor, { action: 'agreement-link', entity: 'loan', entityId: id });
  });
  return findLoan(db, actor, id);
}
