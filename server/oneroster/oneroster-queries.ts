import { eq, sql } from 'drizzle-orm';
import type { OrgMapping, OrgMappingInput } from '@shared/api/oneroster';
import { recordAudit } from '../core/audit';
import { badRequest, notFound } from '../core/errors';
import type { Actor } from '../core/policy';
import { rowsOf, type Database } from '../db/client';
import { oneRosterOrgSchools, schools } from '../db/schema/index';
import type { OrgMatching } from '../imports/parse/oneroster-orgs';

/** What an import needs to find the district's school for a OneRoster org. */
export async function orgMatching(db: Database): Promise<Required<OrgMatching>> {
  const schoolRows = await db
    .select({ id: schools.id, code: schools.code, name: schools.name })
    .from(schools);
  const mappings = await db
    .select({ sourcedId: oneRosterOrgSchools.sourcedId, schoolId: oneRosterOrgSchools.schoolId })
    .from(oneRosterOrgSchools);
  const codeById = new Map(schoolRows.map((row) => [row.id, row.code]));
  const byName = new Map<string, string>();
  for (const row of schoolRows) byName.set(row.name.trim().toLowerCase(), row.code);
  return {
    knownSchoolCodes: new Set(schoolRows.map((row) => row.code)),
    schoolCodeByName: byName,
    schoolCodeByOrg: new Map(
      mappings.flatMap((row) => {
        const code = codeById.get(row.schoolId);
        return code ? [[row.sourcedId, code] as const] : [];
      }),
    ),
  };
}

/**
 * Remembers the school each org of a committed bundle matched, so a later bundle (a delta
 * without orgs.csv, or an org whose identifier changed) finds it by sourcedId. A coordinator's
 * own choice is never replaced by a match.
 */
export async function rememberOrgSchools(
  db: Database,
  matched: readonly { sourcedId: string; name: string; schoolCode: string }[],
): Promise<void> {
  if (matched.length === 0) return;
  await db.execute(sql`
    insert into oneroster_org_schools (sourced_id, org_name, school_id)
    select m.sourced_id, m.org_name, s.id
    from jsonb_to_recordset(${JSON.stringify(
      matched.map((entry) => ({
        sourced_id: entry.sourcedId,
        org_name: entry.name,
        code: entry.schoolCode,
      })),
    )}::jsonb) as m(sourced_id text, org_name text, code text)
    join schools s on s.code = m.code
    on conflict (sourced_id) do update
      set org_name = excluded.org_name, school_id = excluded.school_id, updated_at = now()
      where oneroster_org_schools.chosen = false
        and (oneroster_org_schools.school_id, oneroster_org_schools.org_name)
          is distinct from (excluded.school_id, excluded.org_name)`);
}

/** Every remembered org mapping, by org name. */
export async function listOrgMappings(
  db: Database,
): Promise<{ rows: OrgMapping[]; total: number }> {
  const rows = rowsOf<{
    sourcedId: string;
    orgName: string;
    schoolId: number;
    schoolCode: string;
    schoolName: string;
    chosen: boolean;
    updatedAt: Date | string;
  }>(
    await db.execute(sql`
      select m.sourced_id as "sourcedId", m.org_name as "orgName", m.school_id as "schoolId",
        s.code as "schoolCode", s.name as "schoolName", m.chosen, m.updated_at as "updatedAt"
      from oneroster_org_schools m join schools s on s.id = m.school_id
      order by lower(m.org_name), m.sourced_id`),
  );
  const mapped = rows.map((row) => ({
    ...row,
    updatedAt: new Date(row.updatedAt).toISOString(),
  }));
  return { rows: mapped, total: mapped.length };
}

/** Saves the school a coordinator chose for an org; it wins over any match from then on. */
export async function chooseOrgSchool(
  db: Database,
  actor: Actor,
  input: OrgMappingInput,
): Promise<OrgMapping> {
  return db.transaction(async (tx) => {
    const [school] = await tx.select().from(schools).where(eq(schools.id, input.schoolId));
    if (!school) {
      throw badRequest('That school does not exist.', [
        { field: 'schoolId', message: 'Choose one of the district’s schools.' },
      ]);
    }
    const [before] = await tx
      .select()
      .from(oneRosterOrgSchools)
      .where(eq(oneRosterOrgSchools.sourcedId, input.sourcedId));
    const values = {
      orgName: input.orgName,
      schoolId: school.id,
      chosen: true,
      chosenBy: actor.userId,
      updatedAt: new Date(),
    };
    const [row] = await tx
      .insert(oneRosterOrgSchools)
      .values({ sourcedId: input.sourcedId, ...values })
      .onConflictDoUpdate({ target: oneRosterOrgSchools.sourcedId, set: values })
      .returning();
    await recordAudit(tx, actor, {
      action: before ? 'update' : 'create',
      entity: 'oneroster_org_school',
      entityId: input.sourcedId,
      before,
      after: row,
    });
    return {
      sourcedId: row!.sourcedId,
      orgName: row!.orgName,
      schoolId: school.id,
      schoolCode: school.code,
      schoolName: school.name,
      chosen: true,
      updatedAt: row!.updatedAt.toISOString(),
    };
  });
}

/** Forgets an org's mapping: the next import matches it afresh. */
export async function forgetOrgSchool(
  db: Database,
  actor: Actor,
  sourcedId: string,
): Promise<void> {
  await db.transaction(async (tx) => {
    const [before] = await tx
      .delete(oneRosterOrgSchools)
      .where(eq(oneRosterOrgSchools.sourcedId, sourcedId))
      .returning();
    if (!before) throw notFound('That org mapping');
    await recordAudit(tx, actor, {
      action: 'delete',
      entity: 'oneroster_org_school',
      entityId: sourcedId,
      before,
    });
  });
}
