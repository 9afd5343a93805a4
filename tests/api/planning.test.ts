import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import {
  enrollments,
  ensembles,
  instruments,
  loans,
  repairTickets,
  schoolYears,
  schools,
  students,
  userSchools,
  users,
} from '../../server/db/schema/index';
import { replacementPlanSchema, shortageReportSchema } from '@shared/api/planning';
import { startTestApp, type TestApp } from '../support/test-app';

let app: TestApp;
let coordinator: ReturnType<TestApp['bearer']>;
let director: ReturnType<TestApp['bearer']>;
const ids: Record<string, number> = {};
/** A horizon's per-school split for the two test schools, as [count, totalCents] each. */
const bySchool = (alpha: [number, number], beta: [number, number]) => [
  { schoolId: ids.alpha, schoolCode: 'ALPH', count: alpha[0], totalCents: alpha[1] },
  { schoolId: ids.beta, schoolCode: 'BETA', count: beta[0], totalCents: beta[1] },
];

/**
 * A two-school district written out by hand. Service lives (common practice, no source):
 * brass 15 years, woodwind 12, strings 20. The expected figures below are worked by hand from
 * value = cost × (1 − whole months / (years × 12)) at 2026-09-01.
 */
async function buildDistrict() {
  const db = app.database.db;
  const [alpha, beta] = await db
    .insert(schools)
    .values([
      { code: 'ALPH', name: 'Alpha Middle', level: 'middle' },
      { code: 'BETA', name: 'Beta High', level: 'high' },
    ])
    .returning();
  ids.alpha = alpha!.id;
  ids.beta = beta!.id;
  const [year] = await db
    .insert(schoolYears)
    .values({ name: '2026-27', startsOn: '2026-08-17', endsOn: '2027-06-11', current: true })
    .returning();
  const [, directorUser] = await db
    .insert(users)
    .values([
      { email: 'planner@merrowbasin.example', name: 'Plan Coordinator', role: 'coordinator' },
      { email: 'alpha.director@merrowbasin.example', name: 'Alpha Director', role: 'director' },
    ])
    .returning();
  await db.insert(userSchools).values({ userId: directorUser!.id, schoolId: alpha!.id });
  const rows = await db
    .insert(instruments)
    .values([
      {
        assetTag: 'A-TUBA-1',
        instrumentId: 'tuba',
        homeSchoolId: alpha!.id,
        purchasedOn: '2016-09-01',
        purchaseCostCents: 600000,
        status: 'on-loan',
      },
      {
        assetTag: 'A-FL-1',
        instrumentId: 'flute',
        homeSchoolId: alpha!.id,
        purchasedOn: '2014-03-15',
        purchaseCostCents: 120000,
      },
      {
        assetTag: 'A-OLD-1',
        instrumentId: 'trumpet',
        homeSchoolId: alpha!.id,
        purchasedOn: '2001-01-01',
        purchaseCostCents: 90000,
        status: 'retired',
      },
      {
        assetTag: 'B-CELLO-1',
        instrumentId: 'cello',
        homeSchoolId: beta!.id,
        purchasedOn: '2008-06-01',
        purchaseCostCents: 250000,
      },
      {
        assetTag: 'B-BSN-1',
        instrumentId: 'bassoon',
        homeSchoolId: beta!.id,
        purchasedOn: '2025-09-01',
        purchaseCostCents: 700000,
        condition: 'unserviceable',
      },
      {
        assetTag: 'B-VLN-1',
        instrumentId: 'violin',
        homeSchoolId: beta!.id,
        purchasedOn: '2024-01-01',
        purchaseCostCents: 80000,
      },
      { assetTag: 'B-TUBA-1', instrumentId: 'tuba', homeSchoolId: beta!.id, condition: 'good' },
      {
        assetTag: 'B-TUBA-2',
        instrumentId: 'tuba',
        homeSchoolId: beta!.id,
        condition: 'excellent',
      },
      { assetTag: 'B-TUBA-3', instrumentId: 'tuba', homeSchoolId: beta!.id, condition: 'fair' },
      { assetTag: 'B-EUPH-1', instrumentId: 'euphonium', homeSchoolId: beta!.id },
    ])
    .returning({ id: instruments.id, assetTag: instruments.assetTag });
  const tuba = rows.find((row) => row.assetTag === 'A-TUBA-1')!.id;
  await db.insert(repairTickets).values([
    { instrumentId: tuba, problem: 'Valve rebuild', status: 'closed', finalCostCents: 30000 },
    { instrumentId: tuba, problem: 'Dent removal', status: 'closed', finalCostCents: 20000 },
    { instrumentId: tuba, problem: 'Loose brace', status: 'open', estimateCents: 9000 },
  ]);
  const [alphaBand, betaBand] = await db
    .insert(ensembles)
    .values([
      { schoolId: alpha!.id, name: 'Alpha Band', kind: 'concert-band' },
      { schoolId: beta!.id, name: 'Beta Band', kind: 'concert-band' },
    ])
    .returning();
  const players: [
    school: number,
    ensemble: number,
    instrument: string,
    status: 'active' | 'withdrawn',
  ][] = [
    [alpha!.id, alphaBand!.id, 'tuba', 'active'],
    [alpha!.id, alphaBand!.id, 'tuba', 'active'],
    [alpha!.id, alphaBand!.id, 'tuba', 'active'],
    [alpha!.id, alphaBand!.id, 'tuba', 'withdrawn'],
    [alpha!.id, alphaBand!.id, 'cello', 'active'],
    [alpha!.id, alphaBand!.id, 'flute', 'active'],
    [beta!.id, betaBand!.id, 'euphonium-tc', 'active'],
  ];
  const studentRows = await db
    .insert(students)
    .values(
      players.map(([schoolId, , , status], index) => ({
        studentNumber: `P${index + 1}`,
        firstName: 'Player',
        lastName: `Number${index + 1}`,
        grade: 7,
        schoolId,
        status,
      })),
    )
    .returning({ id: students.id });
  await db.insert(enrollments).values(
    players.map(([, ensembleId, instrumentId], index) => ({
      studentId: studentRows[index]!.id,
      ensembleId,
      schoolYearId: year!.id,
      instrumentId,
    })),
  );
  await db.insert(loans).values({
    instrumentId: tuba,
    studentId: studentRows[0]!.id,
    schoolId: alpha!.id,
    checkedOutOn: '2026-08-20',
    dueOn: '2027-06-11',
    conditionOut: 'good',
  });
}

beforeAll(async () => {
  app = await startTestApp({ template: 'empty' });
  await buildDistrict();
  coordinator = app.bearer(await app.token('planner@merrowbasin.example'));
  director = app.bearer(await app.token('alpha.director@merrowbasin.example'));
});
afterAll(() => app?.close());

describe('Replacement plan', () => {
  it('should value each instrument by straight-line depreciation and total what falls due', async () => {
    const response = await coordinator.get('/api/planning/replacement?asOf=2026-09-01');
    expect(response.status).toBe(200);
    const plan = replacementPlanSchema.parse(response.body);
    const line = (tag: string) => plan.lines.find((row) => row.assetTag === tag)!;
    // 120 of 180 months gone: 600000 × 60/180; repairs to date 30000 + 20000 (the open ticket has no cost yet).
    expect(line('A-TUBA-1')).toMatchObject({
      ageMonths: 120,
      currentValueCents: 200000,
      repairCostCents: 50000,
      repairShareOfValue: 0.25,
      replaceBy: '2031-09-01',
      dueWithinYears: 5,
    });
    // 149 whole months against a 144-month life: nothing left, due now.
    expect(line('A-FL-1')).toMatchObject({
      ageMonths: 149,
      currentValueCents: 0,
      repairShareOfValue: null,
      dueWithinYears: 0,
    });
    // 219 of 240 months: 250000 × 21/240 = 21875; life ends 2028-06-01, inside three years.
    expect(line('B-CELLO-1')).toMatchObject({
      ageMonths: 219,
      currentValueCents: 21875,
      dueWithinYears: 3,
    });
    // Unserviceable is due now whatever its age: 700000 × 132/144 = 641666.67.
    expect(line('B-BSN-1')).toMatchObject({
      ageMonths: 12,
      currentValueCents: 641667,
      dueWithinYears: 0,
    });
    // 32 of 240 months: 80000 × 208/240 = 69333.33; due in 2044, beyond every horizon.
    expect(line('B-VLN-1')).toMatchObject({
      ageMonths: 32,
      currentValueCents: 69333,
      dueWithinYears: null,
    });
    expect(plan.lines.map((row) => row.assetTag)).not.toContain('A-OLD-1');
    expect(plan.unvalued).toBe(4);
    expect(plan.horizons).toEqual([
      {
        years: 1,
        count: 2,
        totalCents: 820000,
        bySchool: bySchool([1, 120000], [1, 700000]),
      },
      {
        years: 3,
        count: 3,
        totalCents: 1070000,
        bySchool: bySchool([1, 120000], [2, 950000]),
      },
      {
        years: 5,
        count: 4,
        totalCents: 1670000,
        bySchool: bySchool([2, 720000], [2, 950000]),
      },
    ]);
  });

  it('should plan only the director’s schools', async () => {
    const plan = replacementPlanSchema.parse(
      (await director.get('/api/planning/replacement?asOf=2026-09-01')).body,
    );
    expect(new Set(plan.lines.map((row) => row.homeSchoolCode))).toEqual(new Set(['ALPH']));
    expect(plan.horizons[2]).toMatchObject({ count: 2, totalCents: 720000 });
    expect((await director.get(`/api/planning/replacement?homeSchoolId=${ids.beta}`)).status).toBe(
      404,
    );
  });
});

describe('Shortages', () => {
  it('should count players without a loan against instruments ready to lend and suggest transfers', async () => {
    const report = shortageReportSchema.parse(
      (await coordinator.get('/api/planning/shortages')).body,
    );
    expect(report.districtProvided).toContain('tuba');
    expect(report.districtProvided).not.toContain('flute');
    const alpha = report.schools.find((school) => school.schoolCode === 'ALPH')!;
    const beta = report.schools.find((school) => school.schoolCode === 'BETA')!;
    // Three active tuba players (the withdrawn one does not count), one already holding A-TUBA-1.
    expect(alpha.lines.find((line) => line.instrumentId === 'tuba')).toMatchObject({
      players: 3,
      onLoan: 1,
      available: 0,
      shortfall: 2,
      surplus: 0,
    });
    expect(alpha.lines.find((line) => line.instrumentId === 'cello')).toMatchObject({
      players: 1,
      available: 0,
      shortfall: 1,
    });
    expect(alpha.lines.map((line) => line.instrumentId)).not.toContain('flute');
    expect(beta.lines.find((line) => line.instrumentId === 'tuba')).toMatchObject({
      players: 0,
      available: 3,
      shortfall: 0,
      surplus: 3,
    });
    // A euphonium player reading treble clef plays the same instrument.
    expect(beta.lines.find((line) => line.instrumentId === 'euphonium')).toMatchObject({
      players: 1,
      available: 1,
      shortfall: 0,
      surplus: 0,
    });
    expect(report.transfers).toEqual([
      {
        instrumentId: 'tuba',
        instrumentName: 'Tuba',
        fromSchoolId: ids.beta,
        fromSchoolCode: 'BETA',
        toSchoolId: ids.alpha,
        toSchoolCode: 'ALPH',
        count: 2,
        assetTags: ['B-TUBA-2', 'B-TUBA-1'],
      },
      {
        instrumentId: 'cello',
        instrumentName: 'Cello',
        fromSchoolId: ids.beta,
        fromSchoolCode: 'BETA',
        toSchoolId: ids.alpha,
        toSchoolCode: 'ALPH',
        count: 1,
        assetTags: ['B-CELLO-1'],
      },
    ]);
    const seenByDirector = shortageReportSchema.parse(
      (await director.get('/api/planning/shortages')).body,
    );
    expect(seenByDirector.schools.map((school) => school.schoolCode)).toEqual(['ALPH']);
    expect(seenByDirector.transfers).toHaveLength(2);
  });
});
