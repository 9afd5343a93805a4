import { eq } from 'drizzle-orm';
import type { Enrollment } from '@shared/api/enrollment';
import type { Database, Transaction } from '../db/client';
import { enrollments, ensembles, schoolYears, schools, students } from '../db/schema/index';
import { instrumentName } from './instrument-order';
import { studentNameColumns } from '../students/student-row';

/**
 * A seat as both the enrollment answers and a student's own page show it: its year, the music
 * engine's instrument id, part, chair, whether it is active and its version.
 */
export const seatColumns = {
  schoolYearId: enrollments.schoolYearId,
  schoolYearName: schoolYears.name,
  instrumentId: enrollments.instrumentId,
  part: enrollments.part,
  chair: enrollments.chair,
  active: enrollments.active,
  version: enrollments.version,
};

/** The columns every enrollment answer selects: the seat, its student, ensemble and year. */
export const enrollmentColumns = {
  id: enrollments.id,
  studentId: enrollments.studentId,
  studentNumber: students.studentNumber,
  ...studentNameColumns,
  ensembleId: enrollments.ensembleId,
  ensembleName: ensembles.name,
  schoolId: ensembles.schoolId,
  schoolCode: schools.code,
  ...seatColumns,
  updatedAt: enrollments.updatedAt,
};

/** The enrollments with their students, ensembles, schools and years, selecting {@link enrollmentColumns}. */
export function selectEnrollments(db: Database | Transaction) {
  return db
    .select(enrollmentColumns)
    .from(enrollments)
    .innerJoin(students, eq(students.id, enrollments.studentId))
    .innerJoin(ensembles, eq(ensembles.id, enrollments.ensembleId))
    .innerJoin(schools, eq(schools.id, ensembles.schoolId))
    .innerJoin(schoolYears, eq(schoolYears.id, enrollments.schoolYearId));
}

/** One selected enrollment row. */
export type EnrollmentRecord = Omit<Enrollment, 'instrumentName' | 'updatedAt'> & {
  updatedAt: Date;
};

/** An enrollment as the API answers it. */
export function toEnrollment(record: EnrollmentRecord): Enrollment {
  return {
    ...record,
    instrumentName: instrumentName(record.instrumentId),
    updatedAt: record.updatedAt.toISOString(),
  };
}
