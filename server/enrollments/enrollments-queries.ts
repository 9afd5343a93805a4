import { and, asc, count, desc, eq, type AnyColumn, type SQL } from 'drizzle-orm';
import { enrollmentFiltersSchema, type Enrollment } from '@shared/api/enrollment';
import type { ListResponse } from '@shared/api/list';
import type { Database } from '../db/client';
import { enrollments, ensembles, students } from '../db/schema/index';
import { badRequest } from '../core/errors';
import { listPage, matchesText, parseListQuery } from '../core/list-query';
import type { Actor } from '../core/policy';
import { ensembleScope } from '../ensembles/ensembles-queries';
import { selectEnrollments, toEnrollment } from './enrollment-row';

const sortOrders: Record<string, AnyColumn[]> = {
  lastName: [students.lastName, students.firstName, enrollments.id],
  ensemble: [ensembles.name, students.lastName, students.firstName, enrollments.id],
  instrument: [enrollments.instrumentId, enrollments.chair, students.lastName, enrollments.id],
  chair: [enrollments.chair, students.lastName, enrollments.id],
  updatedAt: [enrollments.updatedAt, enrollments.id],
};

function orderBy(sort: string | undefined): SQL[] {
  const [field, direction] = (sort ?? 'lastName:asc').split(':') as [string, 'asc' | 'desc'];
  const columns = sortOrders[field];
  if (!columns) {
    throw badRequest(
      `Cannot sort by '${field}'. Sort by one of: ${Object.keys(sortOrders).join(', ')}.`,
      [{ field: 'sort', message: `Unknown field '${field}'.` }],
    );
  }
  return columns.map((column) => (direction === 'desc' ? desc(column) : asc(column)));
}

/** The seats in the actor's schools' ensembles, filtered, searched by student name, paged. */
export async function listEnrollments(
  db: Database,
  actor: Actor,
  query: unknown,
): Promise<ListResponse<Enrollment>> {
  const list = parseListQuery(query, enrollmentFiltersSchema);
  const where = and(
    ensembleScope(actor),
    matchesText(list.q, [
      students.lastName,
      students.firstName,
      students.preferredName,
      students.studentNumber,
    ]),
    list.schoolId !== undefined ? eq(ensembles.schoolId, list.schoolId) : undefined,
    list.studentId !== undefined ? eq(enrollments.studentId, list.studentId) : undefined,
    list.ensembleId !== undefined ? eq(enrollments.ensembleId, list.ensembleId) : undefined,
    list.schoolYearId !== undefined ? eq(enrollments.schoolYearId, list.schoolYearId) : undefined,
    list.active !== undefined ? eq(enrollments.active, list.active) : undefined,
  );
  return listPage(
    list,
    orderBy(list.sort),
    selectEnrollments(db).where(where).$dynamic(),
    db
      .select({ total: count() })
      .from(enrollments)
      .innerJoin(students, eq(students.id, enrollments.studentId))
      .innerJoin(ensembles, eq(ensembles.id, enrollments.ensembleId))
      .where(where),
    toEnrollment,
  );
}
