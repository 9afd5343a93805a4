import { eq } from 'drizzle-orm';
import type { Transaction } from '../db/client';
import { enrollments, ensembles, students, users } from '../db/schema/index';
import { demoSchools, firstNames, lastNames } from './demo-people';
import type { SeededRandom } from './random';

type EnsembleKind = (typeof ensembles.$inferInsert)['kind'];

/** Weights reflect a typical school band's seating, common practice, no source. */
export const bandInstruments = [
  ['flute', 14],
  ['oboe', 2],
  ['clarinet', 16],
  ['bass-clarinet', 3],
  ['bassoon', 2],
  ['alto-sax', 9],
  ['tenor-sax', 3],
  ['bari-sax', 2],
  ['trumpet', 14],
  ['horn', 5],
  ['trombone', 9],
  ['euphonium', 4],
  ['tuba', 3],
  ['glockenspiel', 3],
  ['xylophone', 3],
  ['marimba', 2],
] as const;

export const stringInstruments = [
  ['violin', 50],
  ['viola', 16],
  ['cello', 18],
  ['double-bass', 7],
] as const;

export const ensemblesByLevel: Record<
  string,
  {
    name: string;
    kind: EnsembleKind;
    level: string;
    period: string;
    strings: boolean;
    grades?: number[];
  }[]
> = {
  elementary: [
    {
      name: 'Beginning Band',
      kind: 'beginning-band',
      level: 'beginning',
      period: 'Tue/Thu 8:00',
      strings: false,
    },
    {
      name: 'Beginning Strings',
      kind: 'beginning-strings',
      level: 'beginning',
      period: 'Mon/Wed 8:00',
      strings: true,
    },
  ],
  middle: [
    {
      name: 'Sixth Grade Band',
      kind: 'beginning-band',
      level: 'beginning',
      period: 'Period 2',
      strings: false,
      grades: [6],
    },
    {
      name: 'Concert Band',
      kind: 'concert-band',
      level: 'intermediate',
      period: 'Period 4',
      strings: false,
      grades: [7, 8],
    },
    {
      name: 'Symphonic Band',
      kind: 'symphonic-band',
      level: 'advanced',
      period: 'Period 5',
      strings: false,
      grades: [8],
    },
    {
      name: 'String Orchestra',
      kind: 'string-orchestra',
      level: 'intermediate',
      period: 'Period 3',
      strings: true,
    },
  ],
  high: [
    {
      name: 'Concert Band',
      kind: 'concert-band',
      level: 'intermediate',
      period: 'Period 2',
      strings: false,
      grades: [9, 10],
    },
    {
      name: 'Wind Symphony',
      kind: 'symphonic-band',
      level: 'advanced',
      period: 'Period 3',
      strings: false,
      grades: [11, 12],
    },
    {
      name: 'Marching Band',
      kind: 'marching-band',
      level: 'all',
      period: 'After school',
      strings: false,
    },
    {
      name: 'Chamber Orchestra',
      kind: 'string-orchestra',
      level: 'advanced',
      period: 'Period 5',
      strings: true,
    },
    {
      name: 'Percussion Ensemble',
      kind: 'percussion-ensemble',
      level: 'all',
      period: 'Period 6',
      strings: false,
    },
  ],
};

const gradesByLevel: Record<string, number[]> = {
  elementary: [4, 5],
  middle: [6, 7, 8],
  high: [9, 10, 11, 12],
};

const guardianFirstNames = [
  'Alex',
  'Sam',
  'Jordan',
  'Morgan',
  'Casey',
  'Robin',
  'Taylor',
  'Jamie',
  'Avery',
  'Riley',
];

/** Inserts in batches so no statement nears PostgreSQL's parameter cap. */
export async function insertInBatches<Row>(
  rows: Row[],
  size: number,
  insert: (batch: Row[]) => Promise<unknown>,
) {
  for (let start = 0; start < rows.length; start += size)
    await insert(rows.slice(start, start + size));
}

type DemoSchool = (typeof demoSchools)[number];
type DemoSeat = { index: number; ensemble: string; instrument: string; active: boolean };

/** A school's ensembles for its level; answers their ids by name. */
async function seedEnsembles(
  tx: Transaction,
  school: DemoSchool,
  schoolId: number,
  directorOf: Map<string, number>,
): Promise<Map<string, number>> {
  const definitions = ensemblesByLevel[school.level]!;
  const inserted = await tx
    .insert(ensembles)
    .values(
      definitions.map((definition) => ({
        schoolId,
        name: definition.name,
        kind: definition.kind,
        level: definition.level,
        meetingPeriod: definition.period,
        directorUserId: directorOf.get(school.code) ?? null,
      })),
    )
    .returning({ id: ensembles.id, name: ensembles.name });
  return new Map(inserted.map((row) => [row.name, row.id]));
}

/**
 * A school's invented students, numbered from after `lastNumber`, and their seats (by index in
 * the list): one in an ensemble that fits their grade and instrument, some in the marching band.
 */
function inventStudents(
  random: SeededRandom,
  school: DemoSchool,
  schoolId: number,
  lastNumber: number,
): { studentRows: (typeof students.$inferInsert)[]; seats: DemoSeat[] } {
  const definitions = ensemblesByLevel[school.level]!;
  let studentNumber = lastNumber;
  const studentRows: (typeof students.$inferInsert)[] = [];
  const seats: DemoSeat[] = [];
  for (let index = 0; index < school.students; index += 1) {
    const grade = random.pick(gradesByLevel[school.level]!);
    const lastName = random.pick(lastNames);
    const firstName = school.code === 'HPMS' && index === 0 ? 'Toby' : random.pick(firstNames);
    const strings = random.chance(0.32);
    const instrument = strings
      ? random.weighted(stringInstruments)
      : random.weighted(bandInstruments);
    const guardian = `${random.pick(guardianFirstNames)} ${lastName}`;
    // Drawn in this order so the demo stays the same district it has always been.
    const preferredName = random.chance(0.06) ? random.pick(firstNames) : null;
    // A few students have dropped this year: they keep their old seats, inactive.
    const status = random.chance(0.02) ? 'withdrawn' : 'active';
    studentRows.push({
      studentNumber: String((studentNumber += 1)),
      firstName,
      lastName: school.code === 'HPMS' && index === 0 ? 'Arkwright-Lund' : lastName,
      preferredName,
      grade,
      schoolId,
      status,
      guardianName: guardian,
      guardianEmail: `${guardian.toLowerCase().replace(/[^a-z]+/g, '.')}.${studentNumber}@families.merrowbasin.example`,
    });
    const eligible = definitions.filter(
      (definition) =>
        definition.strings === strings &&
        (!definition.grades || definition.grades.includes(grade)) &&
        definition.kind !== 'marching-band' &&
        definition.kind !== 'percussion-ensemble',
    );
    const percussion = ['glockenspiel', 'xylophone', 'marimba'].includes(instrument);
    const primary =
      percussion && definitions.some((d) => d.kind === 'percussion-ensemble')
        ? definitions.find((d) => d.kind === 'percussion-ensemble')!
        : eligible.length
          ? random.pick(eligible)
          : definitions.find((d) => d.strings === strings)!;
    seats.push({ index, ensemble: primary.name, instrument, active: status === 'active' });
    const marching = definitions.find((d) => d.kind === 'marching-band');
    if (marching && !strings && random.chance(0.4))
      seats.push({ index, ensemble: marching.name, instrument, active: status === 'active' });
  }
  return { studentRows, seats };
}

/**
 * Seeds the demo roster: a few hundred students in every school with their ensembles and
 * enrollments for the current year. The student account is tied to one Heron Point student.
 */
export async function seedDemoRoster(
  tx: Transaction,
  random: SeededRandom,
  context: {
    schoolIds: Map<string, number>;
    directorOf: Map<string, number>;
    schoolYearId: number;
    studentUserId: number;
  },
) {
  let studentNumber = 204_100;
  for (const school of demoSchools) {
    const schoolId = context.schoolIds.get(school.code)!;
    const ensembleId = await seedEnsembles(tx, school, schoolId, context.directorOf);
    const { studentRows, seats } = inventStudents(random, school, schoolId, studentNumber);
    studentNumber += school.students;
    const studentIds: number[] = [];
    await insertInBatches(studentRows, 500, async (batch) => {
      const rows = await tx.insert(students).values(batch).returning({ id: students.id });
      studentIds.push(...rows.map((row) => row.id));
    });
    if (school.code === 'HPMS') {
      await tx
        .update(users)
        .set({ studentId: studentIds[0]! })
        .where(eq(users.id, context.studentUserId));
    }
    await insertInBatches(seats, 500, (batch) =>
      tx.insert(enrollments).values(
        batch.map((seat, position) => ({
          studentId: studentIds[seat.index]!,
          ensembleId: ensembleId.get(seat.ensemble)!,
          schoolYearId: context.schoolYearId,
          instrumentId: seat.instrument,
          part: '',
          chair: (position % 6) + 1,
          active: seat.active,
        })),
      ),
    );
  }
}
