import { and, eq, ne, sql } from 'drizzle-orm';
import type { Database } from '../db/client';
import {
  appSettings,
  feeSchedule,
  instruments,
  loans,
  schoolYears,
  students,
} from '../db/schema/index';
import type { FeeQuote, FeeSchedule } from '@shared/api/fee';
import { instrumentById } from '@shared/music/index';
import { readSetting, writeSetting } from '../core/settings';
import { recordAudit } from '../core/audit';
import { badRequest, notFound } from '../core/errors';
import { assertInScope, inScope, type Actor } from '../core/policy';
import { todayIso } from '../loans/school-calendar';

/** The settings row holding the second-loan rule and the waiver reasons. */
const feeRulesSetting = 'fee-rules';

interface FeeRules {
  additionalLoan: FeeSchedule['additionalLoan'];
  waiverReasons: string[];
  version: number;
}

const families = ['brass', 'woodwind', 'strings', 'percussion'];

function familyOf(instrumentType: string): string | undefined {
  try {
    return instrumentById(instrumentType).family;
  } catch {
    return undefined;
  }
}

/** The schedule: its entries, the second-loan rule and the waiver reasons. */
export async function readFeeSchedule(db: Database, onlinePayments: boolean): Promise<FeeSchedule> {
  const entries = await db
    .select({
      scope: feeSchedule.scope,
      key: feeSchedule.key,
      yearlyFeeCents: feeSchedule.yearlyFeeCents,
    })
    .from(feeSchedule)
    .orderBy(feeSchedule.scope, feeSchedule.key);
  const rules = (await readSetting<FeeRules>(db, feeRulesSetting)) ?? {
    additionalLoan: null,
    waiverReasons: [],
    version: 0,
  };
  return {
    entries,
    additionalLoan: rules.additionalLoan,
    waiverReasons: rules.waiverReasons,
    onlinePayments,
    version: rules.version,
  };
}

/** Replaces the schedule (coordinator). Unknown families or instruments are refused. */
export async function writeFeeSchedule(
  db: Database,
  actor: Actor,
  input: FeeSchedule,
  onlinePayments: boolean,
): Promise<FeeSchedule> {
  const seen = new Set<string>();
  input.entries.forEach((entry, index) => {
    const known =
      entry.scope === 'family' ? families.includes(entry.key) : familyOf(entry.key) !== undefined;
    if (!known)
      throw badRequest(`The fee schedule names an unknown ${entry.scope}: ${entry.key}.`, [
        { field: `entries.${index}.key`, message: `Pick a known ${entry.scope}.` },
      ]);
    const id = `${entry.scope}:${entry.key}`;
    if (seen.has(id))
      throw badRequest(`The fee schedule lists ${entry.key} twice.`, [
        { field: `entries.${index}.key`, message: 'Listed already.' },
      ]);
    seen.add(id);
  });
  const before = await readFeeSchedule(db, onlinePayments);
  if (input.version !== undefined && input.version !== before.version)
    throw badRequest('Someone else changed the fee schedule since you opened it; reload it.');
  await db.transaction(async (tx) => {
    await tx.delete(feeSchedule);
    if (input.entries.length) await tx.insert(feeSchedule).values(input.entries);
    const value = {
      additionalLoan: input.additionalLoan,
      waiverReasons: [...new Set(input.waiverReasons)],
      version: (before.version ?? 0) + 1,
    };
    await tx
      .insert(appSettings)
      .values({ key: feeRulesSetting, value })
      .onConflictDoUpdate({ target: appSettings.key, set: { value, updatedAt: new Date() } });
    await recordAudit(tx, actor, {
      action: 'update',
      entity: 'fee-schedule',
      entityId: 'district',
      before,
      after: input,
    });
  });
  return readFeeSchedule(db, onlinePayments);
}

/** Seeds a schedule without an actor (the demo). */
export async function seedFeeSchedule(
  db: Database,
  schedule: Omit<FeeSchedule, 'version'>,
): Promise<void> {
  if (schedule.entries.length) await db.insert(feeSchedule).values(schedule.entries);
  await writeSetting(db, feeRulesSetting, {
    additionalLoan: schedule.additionalLoan,
    waiverReasons: schedule.waiverReasons,
    version: 1,
  });
}

/** How a new loan's fee was found. */
export interface ComputedFee {
  /** Undefined when the schedule has no entry for the instrument: the fee is then entered by hand. */
  feeCents: number | undefined;
  basis: string;
}

/**
 * A new loan's yearly fee from the schedule: the instrument's own entry, else its family's; a
 * second or later loan in the same school year (of the student, or of the household: the same
 * guardian e-mail) pays the rule's share, rounded to the cent.
 */
export async function computeLoanFee(
  db: Database,
  instrumentType: string,
  student: { id: number; guardianEmail: string | null },
  checkedOutOn: string,
): Promise<ComputedFee> {
  const schedule = await readFeeSchedule(db, false);
  const family = familyOf(instrumentType);
  const entry =
    schedule.entries.find((each) => each.scope === 'instrument' && each.key === instrumentType) ??
    schedule.entries.find((each) => each.scope === 'family' && each.key === family);
  if (!entry) return { feeCents: undefined, basis: 'no schedule entry' };
  const rule = schedule.additionalLoan;
  if (!rule) return { feeCents: entry.yearlyFeeCents, basis: `${entry.scope} ${entry.key}` };
  const [year] = await db
    .select()
    .from(schoolYears)
    .where(sql`${checkedOutOn} between ${schoolYears.startsOn} and ${schoolYears.endsOn}`);
  const sameYear = year
    ? sql`${loans.checkedOutOn} between ${year.startsOn} and ${year.endsOn}`
    : sql`${loans.checkedOutOn} = ${checkedOutOn}`;
  const who =
    rule.basis === 'household' && student.guardianEmail
      ? sql`lower(${students.guardianEmail}) = lower(${student.guardianEmail})`
      : eq(loans.studentId, student.id);
  const [earlier] = await db
    .select({ count: sql<number>`count(*)::int` })
    .from(loans)
    .innerJoin(students, eq(students.id, loans.studentId))
    .where(and(who, sameYear, ne(loans.state, 'lost'), eq(loans.waiver, false)));
  if ((earlier?.count ?? 0) === 0)
    return { feeCents: entry.yearlyFeeCents, basis: `${entry.scope} ${entry.key}` };
  return {
    feeCents: Math.round((entry.yearlyFeeCents * rule.percent) / 100),
    basis: `${entry.scope} ${entry.key}, ${rule.percent}% as a further loan of the ${rule.basis}`,
  };
}

/**
 * A waiver must name one of the district's waiver reasons from the schedule settings; the reason
 * is compared as written there (surrounding spaces ignored).
 */
export async function assertWaiverReason(
  db: Database,
  input: { waiver: boolean; waiverReason?: string | undefined },
): Promise<void> {
  if (!input.waiver) return;
  const { waiverReasons } = await readFeeSchedule(db, false);
  const reason = input.waiverReason?.trim();
  if (!reason)
    throw badRequest('A waiver needs one of the district’s waiver reasons.', [
      { field: 'waiverReason', message: 'Pick a waiver reason from the fee schedule.' },
    ]);
  if (!waiverReasons.includes(reason))
    throw badRequest(
      waiverReasons.length
        ? `“${reason}” is not one of the district’s waiver reasons.`
        : 'The district has no waiver reasons yet; the coordinator adds them to the fee schedule.',
      [{ field: 'waiverReason', message: 'Pick a waiver reason from the fee schedule.' }],
    );
}

/** The fee the schedule gives for lending this instrument to this student today, for the checkout form. */
export async function quoteLoanFee(
  db: Database,
  actor: Actor,
  query: { instrumentId: number; studentId: number },
): Promise<FeeQuote> {
  const [student] = await db.select().from(students).where(eq(students.id, query.studentId));
  if (!student || !inScope(actor, student.schoolId)) throw notFound('That student');
  const [instrument] = await db
    .select()
    .from(instruments)
    .where(eq(instruments.id, query.instrumentId));
  if (!instrument) throw notFound('That instrument');
  assertInScope(actor, instrument.homeSchoolId, 'That instrument');
  const computed = await computeLoanFee(db, instrument.instrumentId, student, todayIso());
  const { waiverReasons } = await readFeeSchedule(db, false);
  return { feeCents: computed.feeCents ?? null, basis: computed.basis, waiverReasons };
}
