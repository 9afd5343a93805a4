import { and, eq, inArray, isNotNull, ne, sql } from 'drizzle-orm';
import { instruments, repairTickets, schools } from '../db/schema/index';
import type { Database } from '../db/client';
import { schoolScope, type Actor } from '../core/policy';
import type { PlannedInstrument } from './replacement-plan';

/** The instruments a plan covers (all but retired ones), with their repair cost to date. */
export async function plannedInstruments(
  db: Database,
  actor: Actor,
  homeSchoolId?: number,
): Promise<PlannedInstrument[]> {
  const scope = schoolScope(actor);
  const repairCost = db
    .select({
      instrumentId: repairTickets.instrumentId,
      cents: sql<number>`sum(${repairTickets.finalCostCents})::int`.as('cents'),
    })
    .from(repairTickets)
    .where(isNotNull(repairTickets.finalCostCents))
    .groupBy(repairTickets.instrumentId)
    .as('repair_cost');
  return db
    .select({
      id: instruments.id,
      assetTag: instruments.assetTag,
      instrumentId: instruments.instrumentId,
      homeSchoolId: instruments.homeSchoolId,
      homeSchoolCode: schools.code,
      condition: instruments.condition,
      purchasedOn: instruments.purchasedOn,
      purchaseCostCents: instruments.purchaseCostCents,
      repairCostCents: sql<number>`coalesce(${repairCost.cents}, 0)`.mapWith(Number),
    })
    .from(instruments)
    .innerJoin(schools, eq(schools.id, instruments.homeSchoolId))
    .leftJoin(repairCost, eq(repairCost.instrumentId, instruments.id))
    .where(
      and(
        ne(instruments.status, 'retired'),
        scope === 'all'
          ? undefined
          : scope.length
            ? inArray(instruments.homeSchoolId, scope)
            : sql`false`,
        homeSchoolId === undefined ? undefined : eq(instruments.homeSchoolId, homeSchoolId),
      ),
    );
}
