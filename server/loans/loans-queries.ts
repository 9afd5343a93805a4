import { and, count, eq, inArray, isNotNull, isNull, lt, ne, or, sql, type SQL } from 'drizzle-orm';
import type { Database, Transaction } from '../db/client';
import { instruments, loans, schools, students } from '../db/schema/index';
import type { ListResponse } from '@shared/api/list';
import { loanFiltersSchema, type Loan } from '@shared/api/loan';
import { can, type Actor } from '../core/policy';
import { listPage, matchesText, orderFor, parseListQuery } from '../core/list-query';
import { notFound } from '../core/errors';
import { cautionsFor, instrumentNameOf } from '../instruments/instrument-cautions';
import { todayIso } from './school-calendar';
import { studentNameColumns } from '../students/student-row';

/** The columns a loan answer is built from. */
export const loanColumns = {
  loan: loans,
  assetTag: instruments.assetTag,
  instrumentType: instruments.instrumentId,
  ...studentNameColumns,
  guardianName: students.guardianName,
  guardianEmail: students.guardianEmail,
  schoolCode: schools.code,
  schoolName: schools.name,
};

/** A loan row with what it joins to. */
export type LoanRow = {
  loan: typeof loans.$inferSelect;
  assetTag: string;
  instrumentType: string;
  firstName: string;
  lastName: string;
  preferredName: string | null;
  guardianName: string | null;
  guardianEmail: string | null;
  schoolCode: string;
  schoolName: string;
};

/** The name a student goes by. */
export function studentNameOf(
  row: Pick<LoanRow, 'firstName' | 'lastName' | 'preferredName'>,
): string {
  return `${row.preferredName ?? row.firstName} ${row.lastName}`;
}

/**
 * A loan as the API answers it. The waiver's reason is left out for every role that may not see
 * it (technicians, viewers, students): only that a waiver was granted is shown.
 */
export function toLoan(row: LoanRow, actor: Actor, today = todayIso()): Loan {
  const { loan } = row;
  return {
    id: loan.id,
    instrumentId: loan.instrumentId,
    assetTag: row.assetTag,
    instrumentType: row.instrumentType,
    instrumentName: instrumentNameOf(row.instrumentType),
    studentId: loan.studentId,
    studentName: studentNameOf(row),
    schoolId: loan.schoolId,
    schoolCode: row.schoolCode,
    checkedOutOn: loan.checkedOutOn,
    dueOn: loan.dueOn,
    accessories: loan.accessories,
    conditionOut: loan.conditionOut,
    conditionIn: loan.conditionIn,
    returnedOn: loan.returnedOn,
    usageFeeCents: loan.usageFeeCents,
    waiver: loan.waiver,
    ...(can(actor, 'loans:see-waivers') ? { waiverReason: loan.waiverReason } : {}),
    state: loan.state,
    overdue: loan.state === 'active' && loan.dueOn < today,
    signed: loan.signedAt !== null,
    signedName: loan.signedName,
    signedAt: loan.signedAt?.toISOString() ?? null,
    agreementExpiresAt: loan.agreementExpiresAt?.toISOString() ?? null,
    agreementTextVersion: loan.agreementTextVersion,
    agreementTextHash: loan.agreementTextHash,
    cautions: cautionsFor(row.instrumentType),
    version: loan.version,
  };
}

/** The SQL condition limiting loans to the actor: a student's own, or the schools' they act for. */
export function loanScope(actor: Actor): SQL | undefined {
  if (actor.role === 'student') {
    return actor.studentId === null ? sql`false` : eq(loans.studentId, actor.studentId);
  }
  if (actor.role === 'coordinator' || actor.role === 'technician') return undefined;
  return actor.schoolIds.length ? inArray(loans.schoolId, actor.schoolIds) : sql`false`;
}

const sortable = {
  checkedOutOn: loans.checkedOutOn,
  dueOn: loans.dueOn,
  returnedOn: loans.returnedOn,
  assetTag: instruments.assetTag,
  studentName: students.lastName,
  schoolCode: schools.code,
  state: loans.state,
};

function selectLoans(db: Database | Transaction) {
  return db
    .select(loanColumns)
    .from(loans)
    .innerJoin(instruments, eq(instruments.id, loans.instrumentId))
    .innerJoin(students, eq(students.id, loans.studentId))
    .innerJoin(schools, eq(schools.id, loans.schoolId));
}

/** The loans the actor may see, filtered, sorted and paged. */
export async function listLoans(
  db: Database,
  actor: Actor,
  query: unknown,
): Promise<ListResponse<Loan>> {
  const list = parseListQuery(query, loanFiltersSchema);
  const today = todayIso();
  const conditions = [loanScope(actor)];
  conditions.push(
    matchesText(list.q, [
      instruments.assetTag,
      students.lastName,
      students.firstName,
      students.studentNumber,
    ]),
  );
  if (list.state) conditions.push(eq(loans.state, list.state));
  if (list.overdue === 'true')
    conditions.push(and(eq(loans.state, 'active'), lt(loans.dueOn, today)));
  if (list.overdue === 'false')
    conditions.push(or(ne(loans.state, 'active'), sql`${loans.dueOn} >= ${today}`));
  if (list.unsigned === 'true') conditions.push(isNull(loans.signedAt));
  if (list.unsigned === 'false') conditions.push(isNotNull(loans.signedAt));
  if (list.schoolId) conditions.push(eq(loans.schoolId, list.schoolId));
  if (list.studentId) conditions.push(eq(loans.studentId, list.studentId));
  if (list.instrumentId) conditions.push(eq(loans.instrumentId, list.instrumentId));
  const where = and(...conditions);
  return listPage(
    list,
    orderFor(list.sort, sortable, 'checkedOutOn:desc', loans.id),
    selectLoans(db).where(where).$dynamic(),
    db
      .select({ total: count() })
      .from(loans)
      .innerJoin(instruments, eq(instruments.id, loans.instrumentId))
      .innerJoin(students, eq(students.id, loans.studentId))
      .innerJoin(schools, eq(schools.id, loans.schoolId))
      .where(where),
    (row) => toLoan(row, actor, today),
  );
}

/** One loan row the actor may see; 404 otherwise. */
export async function findLoanRow(
  db: Database | Transaction,
  actor: Actor | null,
  id: number,
): Promise<LoanRow> {
  const [row] = await selectLoans(db).where(
    and(eq(loans.id, id), actor ? loanScope(actor) : undefined),
  );
  if (!row) throw notFound('That loan');
  return row;
}

/** One loan row by the hash of its agreement token, for the guardian's signing page. */
export async function findLoanByTokenHash(
  db: Database,
  tokenHash: string,
): Promise<LoanRow | undefined> {
  const [row] = await selectLoans(db).where(eq(loans.agreementTokenHash, tokenHash));
  return row;
}

/** One loan the actor may see. */
export async function findLoan(db: Database, actor: Actor, id: number): Promise<Loan> {
  return toLoan(await findLoanRow(db, actor, id), actor);
}
