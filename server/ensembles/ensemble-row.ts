import { sql } from 'drizzle-orm';
import { ensembleKindLabels, type Ensemble, type EnsembleKind } from '@shared/api/ensemble';
import { ensembles, schools, users } from '../db/schema/index';

type TableKind = (typeof ensembles.$inferSelect)['kind'];
// Fails to compile when the shared kinds and the table's kinds drift apart.
const kindsAgree: [TableKind, EnsembleKind] extends [EnsembleKind, TableKind] ? true : never = true;
void kindsAgree;

/** Active seats of the current school year; written out with table names for the subquery. */
export const memberCount = sql<number>`(select count(*)::int from enrollments member
  where member.ensemble_id = "ensembles"."id" and member.active
  and member.school_year_id in (select year.id from school_years year where year.current))`;

/** Active seats of one school year (a past year's, for the year picker). */
export function memberCountIn(schoolYearId: number) {
  return sql<number>`(select count(*)::int from enrollments member
    where member.ensemble_id = "ensembles"."id" and member.active
    and member.school_year_id = ${schoolYearId})`;
}

/** The columns every ensemble answer selects: the ensemble, its school and its director. */
export const ensembleColumns = {
  id: ensembles.id,
  schoolId: ensembles.schoolId,
  schoolCode: schools.code,
  schoolName: schools.name,
  name: ensembles.name,
  kind: ensembles.kind,
  level: ensembles.level,
  meetingPeriod: ensembles.meetingPeriod,
  directorUserId: ensembles.directorUserId,
  directorName: users.name,
  memberCount,
  version: ensembles.version,
  updatedAt: ensembles.updatedAt,
};

/** One selected ensemble row. */
export interface EnsembleRecord {
  id: number;
  schoolId: number;
  schoolCode: string;
  schoolName: string;
  name: string;
  kind: EnsembleKind;
  level: string;
  meetingPeriod: string;
  directorUserId: number | null;
  directorName: string | null;
  memberCount: number;
  version: number;
  updatedAt: Date;
}

/** An ensemble as the API answers it. */
export function toEnsemble(record: EnsembleRecord): Ensemble {
  return {
    ...record,
    kindLabel: ensembleKindLabels[record.kind],
    updatedAt: record.updatedAt.toISOString(),
  };
}
