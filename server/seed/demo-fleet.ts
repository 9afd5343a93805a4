import { inArray } from 'drizzle-orm';
import type { Transaction } from '../db/client';
import {
  countScans,
  counts,
  instrumentEvents,
  instruments,
  repairTickets,
  schools,
  users,
} from '../db/schema/index';
import type { InstrumentCondition } from '@shared/api/instrument';
import { demoSchools } from './demo-people';
import { insertInBatches } from './demo-roster';
import { SeededRandom } from './random';
import { dayBetween, seedDemoLoans, type FleetSeed, type SeededInstrument } from './demo-loans';

/** Invented makers; no real brand. */
const makers: Record<string, string[]> = {
  woodwind: ['Harrowgate Winds', 'Brightwater Reed Co.', 'Talbrook Instruments'],
  brass: ['Carrow Brassworks', 'Fennick & Daughters', 'Talbrook Instruments'],
  strings: ['Lindmere Strings', 'Stellan Workshop'],
  percussion: ['Oakvale Percussion', 'Stellan Workshop'],
};

/** Kinds the fleet holds, with a weight and a typical price in dollars (invented figures). */
const fleetKinds: [id: string, family: string, weight: number, dollars: number][] = [
  ['tuba', 'brass', 6, 5200],
  ['euphonium', 'brass', 6, 3100],
  ['horn', 'brass', 7, 3600],
  ['trombone', 'brass', 4, 1300],
  ['trumpet', 'brass', 4, 1200],
  ['bassoon', 'woodwind', 4, 6800],
  ['oboe', 'woodwind', 4, 3400],
  ['bari-sax', 'woodwind', 5, 4700],
  ['bass-clarinet', 'woodwind', 5, 3300],
  ['tenor-sax', 'woodwind', 3, 2600],
  ['alto-sax', 'woodwind', 3, 1700],
  ['clarinet', 'woodwind', 4, 900],
  ['flute', 'woodwind', 3, 950],
  ['cello', 'strings', 8, 2200],
  ['double-bass', 'strings', 6, 3300],
  ['viola', 'strings', 4, 1100],
  ['violin', 'strings', 4, 800],
  ['marimba', 'percussion', 2, 7400],
  ['xylophone', 'percussion', 2, 3900],
];

const fundingSources = [
  'District general fund',
  '2016 facilities bond',
  'Merrow Basin Education Foundation',
  'Music boosters',
  'Donated',
];
const problems = [
  'Sticky valve',
  'Bent lead pipe',
  'Leaking pads',
  'Cracked bridge',
  'Stuck slide',
  'Loose key post',
  'Open seam',
  'Dented bell',
  'Worn mallet cord',
];
const repairShops = ['Millrace Instrument Repair', 'Tamsin Band & Bow Service'];
const sizeByLevel: Record<string, number> = { elementary: 30, middle: 70, high: 105 };

/**
 * Seeds the demo fleet after the roster: a few hundred invented instruments across the schools,
 * loans (some overdue, some unsigned, one to the demo student), repairs, and a closed count.
 */
export async function seedDemoFleet(tx: Transaction, context: { schoolYearEndsOn: string }) {
  const random = new SeededRandom(20260815);
  const staff = await tx
    .select({ id: users.id, email: users.email, studentId: users.studentId })
    .from(users);
  const technicianId = staff.find((user) => user.email.startsWith('technician@'))?.id ?? null;
  const demoStudentId = staff.find((user) => user.studentId !== null)?.studentId ?? null;
  const schoolRows = await tx
    .select({ id: schools.id, code: schools.code, name: schools.name })
    .from(schools);
  const inserted = await insertInstruments(tx, plannedInstruments(random, schoolRows));
  const seed: FleetSeed = {
    tx,
    random,
    schoolRows,
    inserted,
    technicianId,
    statusOf: new Map(),
    events: inserted.map((row) => ({
      instrumentId: row.id,
      kind: 'purchase',
      at: new Date(`${row.purchasedOn}T12:00:00Z`),
      note: `Bought ${row.purchasedOn}`,
    })),
  };
  await seedDemoLoans(
    seed,
    demoStudentId,
    context.schoolYearEndsOn,
    (instrumentId) => fleetKinds.find((kind) => kind[0] === instrumentId)![1],
  );
  await seedRepairs(seed);
  await seedClosedCount(seed);
  for (const status of ['on-loan', 'in-repair', 'to-clean', 'missing'] as const) {
    const ids = [...seed.statusOf].filter(([, value]) => value === status).map(([id]) => id);
    if (ids.length)
      await tx.update(instruments).set({ status }).where(inArray(instruments.id, ids));
  }
  await insertInBatches(seed.events, 500, (batch) => tx.insert(instrumentEvents).values(batch));
}

/** The invented instruments of every demo school, by the weights of {@link fleetKinds}. */
function plannedInstruments(
  random: SeededRandom,
  schoolRows: { id: number; code: string }[],
): (typeof instruments.$inferInsert)[] {
  let tagNumber = 10_000;
  const planned: (typeof instruments.$inferInsert)[] = [];
  for (const school of demoSchools) {
    const schoolId = schoolRows.find((row) => row.code === school.code)!.id;
    for (let index = 0; index < sizeByLevel[school.level]!; index += 1) {
      const [id, family, , dollars] = random.weighted(
        fleetKinds.map((kind) => [kind, kind[2]] as const),
      );
      const purchasedOn = dayBetween(random, '2008-07-01', '2026-08-31');
      const age = 2026 - Number(purchasedOn.slice(0, 4));
      const condition: InstrumentCondition = random.weighted([
        ['excellent', age < 4 ? 5 : 1],
        ['good', 6],
        ['fair', age > 8 ? 5 : 2],
        ['poor', age > 12 ? 3 : 0.5],
        ['unserviceable', age > 14 ? 1 : 0.1],
      ]);
      planned.push({
        assetTag: `MBU-${(tagNumber += 1)}`,
        instrumentId: id,
        maker: random.pick(makers[family]!),
        model: `${random.pick(['Student', 'Intermediate', 'Concert'])} ${random.integer(1, 9)}00`,
        serial: String(random.integer(100_000, 9_999_999)),
        purchasedOn,
        purchaseCostCents: Math.round(dollars * (0.85 + random.next() * 0.3)) * 100,
        fundingSource: random.pick(fundingSources),
        condition,
        status: condition === 'unserviceable' && random.chance(0.6) ? 'retired' : 'available',
        homeSchoolId: schoolId,
        location: random.pick([
          'Band room storage',
          'Instrument closet',
          'Orchestra room',
          'Stage left cage',
        ]),
      });
    }
  }
  return planned;
}

async function insertInstruments(
  tx: Transaction,
  planned: (typeof instruments.$inferInsert)[],
): Promise<SeededInstrument[]> {
  const inserted: SeededInstrument[] = [];
  await insertInBatches(planned, 400, async (batch) => {
    inserted.push(
      ...(await tx.insert(instruments).values(batch).returning({
        id: instruments.id,
        instrumentId: instruments.instrumentId,
        homeSchoolId: instruments.homeSchoolId,
        purchasedOn: instruments.purchasedOn,
        status: instruments.status,
        condition: instruments.condition,
        assetTag: instruments.assetTag,
      })),
    );
  });
  return inserted;
}

/** Repair tickets, open and closed, on some instruments neither lent nor retired. */
async function seedRepairs({ tx, random, inserted, technicianId, statusOf, events }: FleetSeed) {
  const repairRows: (typeof repairTickets.$inferInsert)[] = [];
  for (const instrument of inserted.filter(
    (row) => !statusOf.has(row.id) && row.status === 'available',
  )) {
    if (!random.chance(0.12)) continue;
    const open = random.chance(0.35);
    const vendor = random.chance(0.6) ? random.pick(repairShops) : null;
    const sentOn = dayBetween(
      random,
      open ? '2026-10-01' : '2024-09-01',
      open ? '2026-11-25' : '2026-05-30',
    );
    const estimate = random.integer(6, 60) * 1000;
    repairRows.push({
      instrumentId: instrument.id,
      problem: random.pick(problems),
      reportedBy: technicianId,
      vendor,
      inHouse: vendor === null,
      estimateCents: estimate,
      finalCostCents: open ? null : Math.round(estimate * (0.8 + random.next() * 0.5)),
      sentOn,
      returnedOn: open ? null : sentOn.replace(/-(\d\d)$/, '-28'),
      status: open ? (vendor ? 'sent' : 'open') : 'closed',
    });
    events.push({
      instrumentId: instrument.id,
      kind: 'repair-open',
      at: new Date(`${sentOn}T10:00:00Z`),
      note: 'Repair ticket opened',
    });
    if (open) statusOf.set(instrument.id, 'in-repair');
    else
      events.push({
        instrumentId: instrument.id,
        kind: 'repair-close',
        at: new Date(`${sentOn.slice(0, 8)}28T10:00:00Z`),
        note: 'Repair closed',
      });
  }
  await insertInBatches(repairRows, 300, (batch) => tx.insert(repairTickets).values(batch));
}

/** Last spring's count at Tamsin Ridge: two instruments were not found and are missing since. */
async function seedClosedCount({
  tx,
  schoolRows,
  inserted,
  technicianId,
  statusOf,
  events,
}: FleetSeed) {
  const trhs = schoolRows.find((row) => row.code === 'TRHS')!;
  const [count] = await tx
    .insert(counts)
    .values({
      schoolId: trhs.id,
      startedBy: technicianId,
      startedAt: new Date('2026-05-18T14:00:00Z'),
      closedAt: new Date('2026-05-20T16:00:00Z'),
      state: 'closed',
    })
    .returning({ id: counts.id });
  const atTrhs = inserted.filter(
    (row) => row.homeSchoolId === trhs.id && row.status !== 'retired' && !statusOf.has(row.id),
  );
  const lost = atTrhs.slice(-2);
  const scans: (typeof countScans.$inferInsert)[] = atTrhs.slice(0, -2).map((row) => ({
    countId: count!.id,
    assetTag: row.assetTag,
    instrumentId: row.id,
    outcome: 'found' as const,
    scannedBy: technicianId,
    scannedAt: new Date('2026-05-19T15:00:00Z'),
  }));
  scans.push({
    countId: count!.id,
    assetTag: 'MBU-0999',
    instrumentId: null,
    outcome: 'unknown',
    scannedBy: technicianId,
    scannedAt: new Date('2026-05-19T15:30:00Z'),
  });
  await insertInBatches(scans, 400, (batch) => tx.insert(countScans).values(batch));
  for (const row of lost) {
    statusOf.set(row.id, 'missing');
    events.push({
      instrumentId: row.id,
      kind: 'marked-missing',
      at: new Date('2026-05-20T16:00:00Z'),
      note: 'Not found in the count at TRHS',
      countId: count!.id,
    });
  }
}
