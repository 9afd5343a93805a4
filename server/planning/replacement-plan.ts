import type { ReplacementLine, ReplacementPlan } from '@shared/api/planning';
import { familyOf, instrumentNameOf } from '../instruments/instrument-cautions';
import { serviceLifeOf, serviceLifeYears } from './service-life';

/** What the plan needs to know of one instrument. */
export interface PlannedInstrument {
  id: number;
  assetTag: string;
  instrumentId: string;
  homeSchoolId: number;
  homeSchoolCode: string;
  condition: string;
  purchasedOn: string | null;
  purchaseCostCents: number | null;
  repairCostCents: number;
}

/** The planning horizons, in years. */
export const planningHorizons = [1, 3, 5] as const;

/** Whole months from one YYYY-MM-DD date to another (0 when the second is earlier). */
export function wholeMonthsBetween(from: string, to: string): number {
  const [fromYear, fromMonth, fromDay] = from.split('-').map(Number) as [number, number, number];
  const [toYear, toMonth, toDay] = to.split('-').map(Number) as [number, number, number];
  const months = (toYear - fromYear) * 12 + (toMonth - fromMonth) - (toDay < fromDay ? 1 : 0);
  return Math.max(0, months);
}

/** A YYYY-MM-DD date some whole years later (29 February becomes 28 February). */
export function addYears(date: string, years: number): string {
  const [year, month, day] = date.split('-').map(Number) as [number, number, number];
  const target = new Date(Date.UTC(year + years, month - 1, day));
  if (target.getUTCMonth() !== month - 1) target.setUTCDate(0);
  return target.toISOString().slice(0, 10);
}

/**
 * Straight-line depreciation: the value falls evenly from the purchase cost to nothing over the
 * service life, month by month — value = cost × (1 − months / (years × 12)), never below 0,
 * rounded to the cent.
 */
export function straightLineValue(costCents: number, ageMonths: number, lifeYears: number): number {
  return Math.round(costCents * Math.max(0, 1 - ageMonths / (lifeYears * 12)));
}

/** Within which planning horizon an instrument falls due: 0 now, 1, 3 or 5 years, or null later. */
function dueWithin(replaceBy: string, condition: string, asOf: string): number | null {
  if (condition === 'unserviceable' || replaceBy <= asOf) return 0;
  return planningHorizons.find((years) => replaceBy <= addYears(asOf, years)) ?? null;
}

/**
 * The replacement plan: each instrument's current value and repair cost to date, and what falls
 * due within 1, 3 and 5 years (an instrument already due counts in every horizon), totalled at
 * purchase cost by school.
 */
export function replacementPlan(instruments: PlannedInstrument[], asOf: string): ReplacementPlan {
  const lines: ReplacementLine[] = [];
  let unvalued = 0;
  for (const instrument of instruments) {
    if (!instrument.purchasedOn || instrument.purchaseCostCents === null) {
      unvalued += 1;
      continue;
    }
    const family = familyOf(instrument.instrumentId);
    const life = serviceLifeOf(family);
    const ageMonths = wholeMonthsBetween(instrument.purchasedOn, asOf);
    const value = straightLineValue(instrument.purchaseCostCents, ageMonths, life);
    const replaceBy = addYears(instrument.purchasedOn, life);
    lines.push({
      id: instrument.id,
      assetTag: instrument.assetTag,
      instrumentId: instrument.instrumentId,
      instrumentName: instrumentNameOf(instrument.instrumentId),
      family,
      homeSchoolId: instrument.homeSchoolId,
      homeSchoolCode: instrument.homeSchoolCode,
      condition: instrument.condition,
      purchasedOn: instrument.purchasedOn,
      purchaseCostCents: instrument.purchaseCostCents,
      serviceLifeYears: life,
      ageMonths,
      currentValueCents: value,
      repairCostCents: instrument.repairCostCents,
      repairShareOfValue:
        value > 0 ? Math.round((instrument.repairCostCents / value) * 1000) / 1000 : null,
      replaceBy,
      dueWithinYears: dueWithin(replaceBy, instrument.condition, asOf),
    });
  }
  lines.sort(
    (a, b) => a.replaceBy.localeCompare(b.replaceBy) || a.assetTag.localeCompare(b.assetTag),
  );
  const horizons = planningHorizons.map((years) => {
    const due = lines.filter(
      (line) => line.dueWithinYears !== null && line.dueWithinYears <= years,
    );
    const bySchool = new Map<
      number,
      { schoolId: number; schoolCode: string; count: number; totalCents: number }
    >();
    for (const line of due) {
      const school = bySchool.get(line.homeSchoolId) ?? {
        schoolId: line.homeSchoolId,
        schoolCode: line.homeSchoolCode,
        count: 0,
        totalCents: 0,
      };
      school.count += 1;
      school.totalCents += line.purchaseCostCents;
      bySchool.set(line.homeSchoolId, school);
    }
    return {
      years,
      count: due.length,
      totalCents: due.reduce((sum, line) => sum + line.purchaseCostCents, 0),
      bySchool: [...bySchool.values()].sort((a, b) => a.schoolCode.localeCompare(b.schoolCode)),
    };
  });
  return { asOf, serviceLifeYears: { ...serviceLifeYears }, lines, horizons, unvalued };
}
