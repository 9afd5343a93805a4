import { and, desc, eq, inArray } from 'drizzle-orm';
import type { Database } from '../db/client';
import {
  instrumentEvents,
  instrumentPhotos,
  loans,
  repairTickets,
  students,
  users,
} from '../db/schema/index';
import type { InstrumentDetail } from '@shared/api/instrument';
import type { Actor } from '../core/policy';
import { findInstrument } from './instruments-queries';
import { todayIso } from '../loans/school-calendar';
import { maySeeStudent } from '../pass-offs/pass-off-rows';
import { studentNameColumns } from '../students/student-row';

/** The instrument's latest 200 events, with the student of each loan event. */
function readTimeline(db: Database, id: number) {
  return db
    .select({
      id: instrumentEvents.id,
      kind: instrumentEvents.kind,
      at: instrumentEvents.at,
      note: instrumentEvents.note,
      userName: users.name,
      loanId: instrumentEvents.loanId,
      repairId: instrumentEvents.repairId,
      countId: instrumentEvents.countId,
      studentId: students.id,
      studentSchoolId: students.schoolId,
      studentNumber: students.studentNumber,
      ...studentNameColumns,
    })
    .from(instrumentEvents)
    .leftJoin(users, eq(users.id, instrumentEvents.userId))
    .leftJoin(loans, eq(loans.id, instrumentEvents.loanId))
    .leftJoin(students, eq(students.id, loans.studentId))
    .where(eq(instrumentEvents.instrumentId, id))
    .orderBy(desc(instrumentEvents.at), desc(instrumentEvents.id))
    .limit(200);
}

type TimelineRow = Awaited<ReturnType<typeof readTimeline>>[number];

/** One event as the timeline shows it. */
function timelineEvent(
  actor: Actor,
  instrument: { purchasedOn: string | null },
  {
    studentId,
    studentSchoolId,
    studentNumber,
    firstName,
    preferredName,
    lastName,
    ...event
  }: TimelineRow,
) {
  // The student a loan event is about, named only to those who may see that student.
  const named =
    studentId !== null &&
    studentSchoolId !== null &&
    maySeeStudent(actor, { id: studentId, schoolId: studentSchoolId });
  // "Purchased" only with a known purchase date, on that date; otherwise it was added.
  const purchase = event.kind === 'purchase';
  return {
    ...event,
    kind: purchase && !instrument.purchasedOn ? ('added' as const) : event.kind,
    at:
      purchase && instrument.purchasedOn
        ? `${instrument.purchasedOn}T12:00:00.000Z`
        : event.at.toISOString(),
    studentName: named ? `${preferredName ?? firstName} ${lastName}` : null,
    studentNumber: named ? studentNumber : null,
  };
}

/** The instrument's active loan, if it is out. */
async function readActiveLoan(db: Database, id: number) {
  const [activeLoan] = await db
    .select({
      id: loans.id,
      studentId: loans.studentId,
      ...studentNameColumns,
      schoolId: loans.schoolId,
      checkedOutOn: loans.checkedOutOn,
      dueOn: loans.dueOn,
      signedAt: loans.signedAt,
    })
    .from(loans)
    .innerJoin(students, eq(students.id, loans.studentId))
    .where(and(eq(loans.instrumentId, id), eq(loans.state, 'active')));
  return activeLoan;
}

/** The instrument's open repair tickets (open or sent out). */
function readOpenRepairs(db: Database, id: number) {
  return db
    .select({
      id: repairTickets.id,
      problem: repairTickets.problem,
      status: repairTickets.status,
      vendor: repairTickets.vendor,
      sentOn: repairTickets.sentOn,
    })
    .from(repairTickets)
    .where(and(eq(repairTickets.instrumentId, id), inArray(repairTickets.status, ['open', 'sent'])))
    .orderBy(repairTickets.id);
}

/** One instrument with its timeline, photos, active loan and open repair tickets. */
export async function instrumentDetail(
  db: Database,
  actor: Actor,
  id: number,
): Promise<InstrumentDetail> {
  const instrument = await findInstrument(db, actor, id);
  const [timeline, photos, activeLoan, openRepairs] = await Promise.all([
    readTimeline(db, id),
    db
      .select()
      .from(instrumentPhotos)
      .where(eq(instrumentPhotos.instrumentId, id))
      .orderBy(instrumentPhotos.id),
    readActiveLoan(db, id),
    readOpenRepairs(db, id),
  ]);
  return {
    ...instrument,
    timeline: timeline.map((row) => timelineEvent(actor, instrument, row)),
    photos: photos.map((photo) => ({
      id: photo.id,
      contentType: photo.contentType,
      sizeBytes: photo.sizeBytes,
      url: `/api/instruments/${id}/photos/${photo.id}`,
      createdAt: photo.createdAt.toISOString(),
    })),
    activeLoan: activeLoan
      ? {
          id: activeLoan.id,
          studentId: activeLoan.studentId,
          studentName: `${activeLoan.preferredName ?? activeLoan.firstName} ${activeLoan.lastName}`,
          schoolId: activeLoan.schoolId,
          checkedOutOn: activeLoan.checkedOutOn,
          dueOn: activeLoan.dueOn,
          overdue: activeLoan.dueOn < todayIso(),
          signed: activeLoan.signedAt !== null,
        }
      : null,
    openRepairs,
  };
}
