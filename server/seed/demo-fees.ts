import { and, eq, gt } from 'drizzle-orm';
import type { Transaction } from '../db/client';
import { appSettings, feeLedger, feeSchedule, loans } from '../db/schema/index';

/** The demo district's schedule: one yearly fee for every family, and two waiver reasons. */
const demoSchedule = {
  entries: [
    { scope: 'family' as const, key: 'brass', yearlyFeeCents: 4500 },
    { scope: 'family' as const, key: 'woodwind', yearlyFeeCents: 4500 },
    { scope: 'family' as const, key: 'strings', yearlyFeeCents: 4500 },
    { scope: 'family' as const, key: 'percussion', yearlyFeeCents: 4500 },
  ],
  additionalLoan: null,
  waiverReasons: ['Family request, approved by the director', 'Free or reduced-price meals'],
  version: 1,
};

const paidBy = ['Cheque', 'Cash at the front office', 'Money order'];

/**
 * The demo's fee ledger, all taken by hand (the local payment service starts empty on every run):
 * last year's loans paid, about half of this year's paid and the rest owed, waived loans owing
 * nothing, and one payment refunded.
 */
export async function seedDemoFees(tx: Transaction): Promise<void> {
  await tx.insert(feeSchedule).values(demoSchedule.entries);
  const { version: _version, entries: _entries, ...rules } = demoSchedule;
  await tx.insert(appSettings).values({ key: 'fee-rules', value: { ...rules, version: 1 } });
  const owing = await tx
    .select({
      id: loans.id,
      schoolId: loans.schoolId,
      fee: loans.usageFeeCents,
      state: loans.state,
      checkedOutOn: loans.checkedOutOn,
    })
    .from(loans)
    .where(and(eq(loans.waiver, false), gt(loans.usageFeeCents, 0)))
    .orderBy(loans.id);
  const entries: (typeof feeLedger.$inferInsert)[] = [];
  let refunded = false;
  for (const loan of owing) {
    const paid = loan.state !== 'active' || loan.id % 2 === 0;
    if (!paid) continue;
    const at = new Date(`${loan.checkedOutOn}T17:00:00Z`);
    at.setUTCDate(at.getUTCDate() + 3 + (loan.id % 9));
    entries.push({
      loanId: loan.id,
      schoolId: loan.schoolId,
      kind: 'manual-payment',
      amountCents: loan.fee,
      reason: `${paidBy[loan.id % paidBy.length]} ${1000 + loan.id}`,
      at,
    });
    if (!refunded && loan.state === 'active') {
      refunded = true;
      entries.push({
        loanId: loan.id,
        schoolId: loan.schoolId,
        kind: 'refund',
        amountCents: loan.fee,
        reason: 'Fee paid twice, once by each parent; paid back by cheque',
        at: new Date(at.getTime() + 7 * 86_400_000),
      });
    }
  }
  if (entries.length) await tx.insert(feeLedger).values(entries);
}
