import { and, asc, eq, sql, type SQL } from 'drizzle-orm';
import type { Database, Transaction } from '../db/client';
import {
  feeLedger,
  feePaymentAttempts,
  instruments,
  loans,
  schools,
  students,
} from '../db/schema/index';
import {
  feeFiltersSchema,
  type FeeDetail,
  type FeeList,
  type FeeRow,
  type FeeStatus,
} from '@shared/api/fee';
import { can, type Actor } from '../core/policy';
import { parseListQuery, matchesText } from '../core/list-query';
import { notFound } from '../core/errors';
import { loanScope } from '../loans/loans-queries';
import { instrumentNameOf } from '../instruments/instrument-cautions';
import { studentNameColumns } from '../students/student-row';

type Queryable = Database | Transaction;

/** A loan's money, summed from the ledger. */
export interface FeeFigures {
  feeCents: number;
  waived: boolean;
  paidCents: number;
  refundedCents: number;
  mismatchCents: number;
}

/**
 * How a loan's fee stands. Money that did not match the fee is never counted as paid; a refund by
 * the district closes the fee (the pay link then asks for nothing), unless money paid still covers it.
 */
export function feeStatusOf(figures: FeeFigures): { status: FeeStatus; owedCents: number } {
  const net = figures.paidCents - figures.refundedCents;
  if (figures.waived) return { status: 'waived', owedCents: 0 };
  if (figures.feeCents > 0 && net >= figures.feeCents) return { status: 'paid', owedCents: 0 };
  if (figures.refundedCents > 0) return { status: 'refunded', owedCents: 0 };
  if (figures.feeCents === 0) return { status: 'none', owedCents: 0 };
  if (figures.mismatchCents > 0) return { status: 'mismatch', owedCents: 0 };
  if (net > 0) return { status: 'part-paid', owedCents: figures.feeCents - net };
  return { status: 'owed', owedCents: figures.feeCents };
}

const paid = sql<number>`coalesce(sum(${feeLedger.amountCents}) filter (where ${feeLedger.kind} in ('payment', 'manual-payment')), 0)::int`;
const refunded = sql<number>`coalesce(sum(${feeLedger.amountCents}) filter (where ${feeLedger.kind} = 'refund'), 0)::int`;
const mismatch = sql<number>`coalesce(sum(${feeLedger.amountCents}) filter (where ${feeLedger.kind} = 'mismatch'), 0)::int`;

const feeColumns = {
  loanId: loans.id,
  studentId: loans.studentId,
  ...studentNameColumns,
  schoolId: loans.schoolId,
  schoolCode: schools.code,
  schoolYear: sql<
    string | null
  >`(select y.name from school_years y where ${loans.checkedOutOn} between y.starts_on and y.ends_on order by y.starts_on desc limit 1)`,
  assetTag: instruments.assetTag,
  instrumentType: instruments.instrumentId,
  checkedOutOn: loans.checkedOutOn,
  feeCents: loans.usageFeeCents,
  waived: loans.waiver,
  waiverReason: loans.waiverReason,
  paidCents: paid,
  refundedCents: refunded,
  mismatchCents: mismatch,
};

type RawFeeRow = { [Key in keyof typeof feeColumns]: unknown } & {
  loanId: number;
  studentId: number;
  firstName: string;
  lastName: string;
  preferredName: string | null;
  schoolId: number;
  schoolCode: string;
  schoolYear: string | null;
  assetTag: string;
  instrumentType: string;
  checkedOutOn: string;
  feeCents: number;
  waived: boolean;
  waiverReason: string | null;
  paidCents: number;
  refundedCents: number;
  mismatchCents: number;
};

function toFeeRow(raw: RawFeeRow, actor: Actor | null): FeeRow {
  const { status, owedCents } = feeStatusOf(raw);
  return {
    loanId: raw.loanId,
    studentId: raw.studentId,
    studentName: `${raw.preferredName ?? raw.firstName} ${raw.lastName}`,
    schoolId: raw.schoolId,
    schoolCode: raw.schoolCode,
    schoolYear: raw.schoolYear,
    assetTag: raw.assetTag,
    instrumentName: instrumentNameOf(raw.instrumentType),
    checkedOutOn: raw.checkedOutOn,
    feeCents: raw.feeCents,
    paidCents: raw.paidCents,
    refundedCents: raw.refundedCents,
    owedCents,
    mismatchCents: raw.mismatchCents,
    waived: raw.waived,
    ...(actor === null || can(actor, 'loans:see-waivers')
      ? { waiverReason: raw.waiverReason }
      : {}),
    status,
  };
}

async function selectFeeRows(db: Queryable, where: SQL | undefined): Promise<RawFeeRow[]> {
  return (await db
    .select(feeColumns)
    .from(loans)
    .innerJoin(students, eq(students.id, loans.studentId))
    .innerJoin(schools, eq(schools.id, loans.schoolId))
    .innerJoin(instruments, eq(instruments.id, loans.instrumentId))
    .leftJoin(feeLedger, eq(feeLedger.loanId, loans.id))
    .where(where)
    .groupBy(loans.id, students.id, schools.id, instruments.id)
    .orderBy(asc(schools.code), asc(students.lastName), asc(loans.id))) as RawFeeRow[];
}

/** One loan's fee row (no actor: the guardian's page and the webhook). */
export async function feeRowOf(
  db: Queryable,
  loanId: number,
  actor: Actor | null = null,
): Promise<FeeRow> {
  const [raw] = await selectFeeRows(
    db,
    and(eq(loans.id, loanId), actor ? loanScope(actor) : undefined),
  );
  if (!raw) throw notFound('That loan');
  return toFeeRow(raw, actor);
}

/** Every fee row the actor may see that matches the filters (the list, the summary and the export). */
export async function allFeeRows(db: Database, actor: Actor, query: unknown): Promise<FeeRow[]> {
  const filters = parseListQuery(query, feeFiltersSchema);
  const conditions: (SQL | undefined)[] = [loanScope(actor)];
  if (filters.schoolId) conditions.push(eq(loans.schoolId, filters.schoolId));
  if (filters.studentId) conditions.push(eq(loans.studentId, filters.studentId));
  conditions.push(
    matchesText(filters.q, [instruments.assetTag, students.lastName, students.firstName]),
  );
  let rows = (await selectFeeRows(db, and(...conditions))).map((raw) => toFeeRow(raw, actor));
  if (filters.status) rows = rows.filter((row) => row.status === filters.status);
  if (filters.year) rows = rows.filter((row) => row.schoolYear === filters.year);
  return rows;
}

function totalsOf(rows: FeeRow[]) {
  return {
    feeCents: rows.reduce((sum, row) => sum + (row.waived ? 0 : row.feeCents), 0),
    paidCents: rows.reduce((sum, row) => sum + row.paidCents, 0),
    refundedCents: rows.reduce((sum, row) => sum + row.refundedCents, 0),
    owedCents: rows.reduce((sum, row) => sum + row.owedCents, 0),
    waivedLoans: rows.filter((row) => row.waived).length,
    loans: rows.length,
  };
}

/** `GET /api/fees`: a page of fee rows and the totals of every matching row. */
export async function listFees(db: Database, actor: Actor, query: unknown): Promise<FeeList> {
  const list = parseListQuery(query, feeFiltersSchema);
  const rows = await allFeeRows(db, actor, query);
  const offset = list.offset ?? 0;
  const limit = list.limit ?? 100;
  return { rows: rows.slice(offset, offset + limit), total: rows.length, totals: totalsOf(rows) };
}

/** Totals by student, school or school year. */
export async function summariseFees(
  db: Database,
  actor: Actor,
  by: 'student' | 'school' | 'year',
  query: unknown,
) {
  const rows = await allFeeRows(db, actor, query);
  const groups = new Map<string, { label: string; rows: FeeRow[] }>();
  for (const row of rows) {
    const [key, label] =
      by === 'student'
        ? [String(row.studentId), `${row.studentName} (${row.schoolCode})`]
        : by === 'school'
          ? [String(row.schoolId), row.schoolCode]
          : [row.schoolYear ?? 'none', row.schoolYear ?? 'No school year'];
    const group = groups.get(key) ?? { label, rows: [] };
    group.rows.push(row);
    groups.set(key, group);
  }
  return {
    by,
    groups: [...groups.entries()].map(([key, group]) => ({
      key,
      label: group.label,
      ...totalsOf(group.rows),
    })),
  };
}

/** One loan's ledger and checkout attempts (coordinator and directors). */
export async function feeDetail(db: Database, actor: Actor, loanId: number): Promise<FeeDetail> {
  const fee = await feeRowOf(db, loanId, actor);
  const ledger = await db
    .select()
    .from(feeLedger)
    .where(eq(feeLedger.loanId, loanId))
    .orderBy(asc(feeLedger.at), asc(feeLedger.id));
  const attempts = await db
    .select()
    .from(feePaymentAttempts)
    .where(eq(feePaymentAttempts.loanId, loanId))
    .orderBy(asc(feePaymentAttempts.attempt));
  return {
    fee,
    ledger: ledger.map((entry) => ({
      id: entry.id,
      kind: entry.kind,
      amountCents: entry.amountCents,
      currency: entry.currency,
      reference: entry.reference,
      reason: entry.reason,
      at: entry.at.toISOString(),
    })),
    attempts: attempts.map((attempt) => ({
      attempt: attempt.attempt,
      sessionId: attempt.sessionId,
      amountCents: attempt.amountCents,
      currency: attempt.currency,
      status: attempt.status,
      note: attempt.note,
      createdAt: attempt.createdAt.toISOString(),
    })),
  };
}

/** The ledger sums per loan for the given loans (reconciliation). */
export async function ledgerByIntent(db: Database) {
  return db
    .select({
      loanId: feePaymentAttempts.loanId,
      sessionId: feePaymentAttempts.sessionId,
      paymentIntentId: feePaymentAttempts.paymentIntentId,
      status: feePaymentAttempts.status,
      amountCents: feePaymentAttempts.amountCents,
    })
    .from(feePaymentAttempts);
}
