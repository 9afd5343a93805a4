import { and, eq } from 'drizzle-orm';
import type { Transaction } from '../db/client';
import { enrollments, instrumentEvents, loans, students } from '../db/schema/index';
import type { InstrumentCondition, InstrumentStatus } from '@shared/api/instrument';
import { isWindInstrument } from '../instruments/instrument-cautions';
import { agreementFor, defaultAgreementText, sha256Hex } from '../loans/agreement-text';
import type { LoanRow } from '../loans/loans-queries';
import { insertInBatches } from './demo-roster';
import type { SeededRandom } from './random';
import { studentNameColumns } from '../students/student-row';

const iso = (date: Date) => date.toISOString().slice(0, 10);
/** A day from `from` to `to` (YYYY-MM-DD), drawn from the seed's sequence. */
export const dayBetween = (random: SeededRandom, from: string, to: string) => {
  const start = Date.parse(`${from}T00:00:00Z`);
  return iso(
    new Date(
      start +
        random.integer(0, Math.round((Date.parse(`${to}T00:00:00Z`) - start) / 86_400_000)) *
          86_400_000,
    ),
  );
};

/** An instrument of the demo fleet as the later steps of the seed need it. */
export interface SeededInstrument {
  id: number;
  instrumentId: string;
  homeSchoolId: number;
  purchasedOn: string | null;
  status: InstrumentStatus;
  condition: InstrumentCondition;
  assetTag: string;
}

/** What the steps of the fleet seed share: the instruments, their new statuses, their events. */
export interface FleetSeed {
  tx: Transaction;
  random: SeededRandom;
  schoolRows: { id: number; code: string; name: string }[];
  inserted: SeededInstrument[];
  technicianId: number | null;
  statusOf: Map<number, InstrumentStatus>;
  events: (typeof instrumentEvents.$inferInsert)[];
}

/** Accessories a loan of each family goes out with. */
export const accessoriesByFamily: Record<string, string[]> = {
  woodwind: ['case', 'neck strap', 'cleaning swab'],
  brass: ['case', 'valve oil', 'lyre'],
  strings: ['case', 'bow', 'rosin'],
  percussion: ['mallets', 'cover'],
};

type Player = Awaited<ReturnType<typeof activePlayers>>[number];

function activePlayers(tx: Transaction) {
  return tx
    .select({
      studentId: students.id,
      schoolId: students.schoolId,
      instrumentId: enrollments.instrumentId,
      ...studentNameColumns,
      guardianName: students.guardianName,
      guardianEmail: students.guardianEmail,
    })
    .from(enrollments)
    .innerJoin(students, eq(students.id, enrollments.studentId))
    .where(and(eq(students.status, 'active'), eq(enrollments.active, true)));
}

/**
 * This year's loans (some overdue, some unsigned, one to the demo student) and last year's,
 * returned in June; the wind ones not yet cleaned wait in to-clean.
 */
export async function seedDemoLoans(
  seed: FleetSeed,
  demoStudentId: number | null,
  schoolYearEndsOn: string,
  familyOf: (instrumentId: string) => string,
) {
  const { tx, random, inserted, statusOf, events } = seed;
  const players = await activePlayers(tx);
  const borrowed = new Set<number>();
  const lentBySchool = new Map<number, number>();
  const loanRows: (typeof loans.$inferInsert)[] = [];
  const loanEvents: { instrumentId: number; at: Date; note: string }[] = [];
  const byKind = (schoolId: number, kind: string) =>
    players.filter(
      (player) =>
        player.schoolId === schoolId &&
        player.instrumentId === kind &&
        !borrowed.has(player.studentId),
    );
  const lendable = inserted.filter((row) => row.status === 'available' && row.condition !== 'poor');
  const demoPlayer = players.find((player) => player.studentId === demoStudentId);
  for (const instrument of lendable) {
    const forDemo =
      demoPlayer &&
      !borrowed.has(demoPlayer.studentId) &&
      instrument.homeSchoolId === demoPlayer.schoolId &&
      instrument.instrumentId === demoPlayer.instrumentId;
    if (!forDemo && !random.chance(0.55)) continue;
    const candidates = forDemo
      ? [demoPlayer]
      : byKind(instrument.homeSchoolId, instrument.instrumentId);
    if (candidates.length === 0) continue;
    const student = forDemo ? demoPlayer : random.pick(candidates);
    borrowed.add(student.studentId);
    const lentHere = (lentBySchool.get(student.schoolId) ?? 0) + 1;
    lentBySchool.set(student.schoolId, lentHere);
    const school = seed.schoolRows.find((row) => row.id === student.schoolId)!;
    const { loan, event } = currentLoan(random, {
      instrument,
      student,
      school,
      forDemo: Boolean(forDemo),
      lentHere,
      schoolYearEndsOn,
      family: familyOf(instrument.instrumentId),
    });
    loanEvents.push(event);
    loanRows.push(loan);
    statusOf.set(instrument.id, 'on-loan');
  }
  lastYearLoans(seed, players, lendable, loanRows, loanEvents);
  await insertInBatches(loanRows, 300, (batch) => tx.insert(loans).values(batch));
  events.push(...loanEvents.map((event) => ({ ...event, kind: 'loan-out' as const })));
}

/** One loan of this year: every eighth of a school overdue, most signed by the guardian. */
function currentLoan(
  random: SeededRandom,
  lending: {
    instrument: SeededInstrument;
    student: Player;
    school: { code: string; name: string };
    forDemo: boolean;
    lentHere: number;
    schoolYearEndsOn: string;
    family: string;
  },
) {
  const { instrument, student, school, forDemo, lentHere } = lending;
  // Every eighth loan of a school is overdue, so every school's overdue list has some.
  const overdue = !forDemo && lentHere % 8 === 3;
  const signed = forDemo || random.chance(0.8);
  const checkedOutOn = dayBetween(random, '2026-08-24', '2026-11-20');
  const dueOn = overdue ? dayBetween(random, '2026-10-01', '2026-11-27') : lending.schoolYearEndsOn;
  const waiver = random.chance(0.15);
  const loan = {
    instrumentId: instrument.id,
    studentId: student.studentId,
    schoolId: student.schoolId,
    checkedOutOn,
    dueOn: dueOn < checkedOutOn ? '2026-11-27' : dueOn,
    accessories: accessoriesByFamily[lending.family]!,
    conditionOut: instrument.condition,
    usageFeeCents: waiver ? 0 : 4500,
    waiver,
    waiverReason: waiver && random.chance(0.5) ? 'Family request, approved by the director' : null,
    agreementTokenHash: sha256Hex(`demo-token-${instrument.id}-${random.next()}`),
    agreementExpiresAt: new Date(`${checkedOutOn}T00:00:00Z`),
    state: 'active' as const,
  };
  const event = {
    instrumentId: instrument.id,
    at: new Date(`${checkedOutOn}T15:00:00Z`),
    note: `Lent to a ${school.code} student`,
  };
  if (signed) {
    const row = {
      loan: {
        ...loan,
        conditionIn: null,
        returnedOn: null,
        signedAt: null,
      } as unknown as LoanRow['loan'],
      assetTag: instrument.assetTag,
      instrumentType: instrument.instrumentId,
      ...student,
      schoolCode: school.code,
      schoolName: school.name,
    } as LoanRow;
    const text = agreementFor(row, defaultAgreementText);
    Object.assign(loan, {
      signedName: student.guardianName ?? 'Guardian',
      signedAt: new Date(`${checkedOutOn}T20:30:00Z`),
      signedText: text,
      agreementTextHash: sha256Hex(text),
      agreementTextVersion: 0,
    });
  } else {
    loan.agreementExpiresAt = new Date(Date.parse(`${checkedOutOn}T00:00:00Z`) + 14 * 86_400_000);
  }
  return { loan, event };
}

/** Last year's loans, returned in June; the wind ones not yet cleaned wait in to-clean. */
function lastYearLoans(
  { random, statusOf, events }: FleetSeed,
  players: Player[],
  lendable: SeededInstrument[],
  loanRows: (typeof loans.$inferInsert)[],
  loanEvents: { instrumentId: number; at: Date; note: string }[],
) {
  for (const instrument of lendable.filter((row) => !statusOf.has(row.id)).slice(0, 40)) {
    const student = random.pick(
      players.filter((player) => player.schoolId === instrument.homeSchoolId),
    );
    if (!student) continue;
    loanRows.push({
      instrumentId: instrument.id,
      studentId: student.studentId,
      schoolId: student.schoolId,
      checkedOutOn: '2025-09-02',
      dueOn: '2026-06-12',
      returnedOn: '2026-06-05',
      conditionOut: instrument.condition,
      conditionIn: instrument.condition,
      state: 'returned',
      usageFeeCents: 4500,
      signedName: student.guardianName,
      signedAt: new Date('2025-09-03T19:00:00Z'),
    });
    loanEvents.push({
      instrumentId: instrument.id,
      at: new Date('2025-09-02T15:00:00Z'),
      note: 'Lent for 2025-26',
    });
    events.push({
      instrumentId: instrument.id,
      kind: 'return',
      at: new Date('2026-06-05T15:00:00Z'),
      note: 'Returned at the end of the year',
    });
    if (isWindInstrument(instrument.instrumentId) && random.chance(0.2))
      statusOf.set(instrument.id, 'to-clean');
  }
}
