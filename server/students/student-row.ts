import { formatGradeLevel } from '@shared/roster/grade-level';
import type { Student } from '@shared/api/student';
import type { Actor } from '../core/policy';
import { schools, students } from '../db/schema/index';
import type { SeatSummary } from './student-seats';

/** The columns a student's name is shown from: first, last and the name they go by. */
export const studentNameColumns = {
  firstName: students.firstName,
  lastName: students.lastName,
  preferredName: students.preferredName,
};

/** The columns every student answer selects: the student and its school's code and name. */
export const studentColumns = {
  id: students.id,
  studentNumber: students.studentNumber,
  ...studentNameColumns,
  grade: students.grade,
  schoolId: students.schoolId,
  schoolCode: schools.code,
  schoolName: schools.name,
  status: students.status,
  guardianName: students.guardianName,
  guardianEmail: students.guardianEmail,
  version: students.version,
  updatedAt: students.updatedAt,
};

/** One selected student row with its school. */
export type StudentRecord = Pick<
  typeof students.$inferSelect,
  | 'id'
  | 'studentNumber'
  | 'firstName'
  | 'lastName'
  | 'preferredName'
  | 'grade'
  | 'schoolId'
  | 'status'
  | 'guardianName'
  | 'guardianEmail'
  | 'version'
  | 'updatedAt'
> & { schoolCode: string; schoolName: string };

/**
 * Whether the actor may see guardians' names and e-mail addresses: personal data kept to the
 * people who contact families (coordinator and directors).
 */
export function seesGuardians(actor: Actor): boolean {
  return actor.role === 'coordinator' || actor.role === 'director';
}

/** A student as the API answers it; guardian fields only for those who may see them. */
export function toStudent(record: StudentRecord, seats: SeatSummary, actor: Actor): Student {
  const student: Student = {
    id: record.id,
    studentNumber: record.studentNumber,
    firstName: record.firstName,
    lastName: record.lastName,
    preferredName: record.preferredName,
    grade: record.grade,
    gradeLabel: formatGradeLevel(record.grade),
    schoolId: record.schoolId,
    schoolCode: record.schoolCode,
    schoolName: record.schoolName,
    status: record.status,
    ...seats,
    version: record.version,
    updatedAt: record.updatedAt.toISOString(),
  };
  if (seesGuardians(actor)) {
    student.guardianName = record.guardianName;
    student.guardianEmail = record.guardianEmail;
  }
  return student;
}
