import { sql } from 'drizzle-orm';
import { eq } from 'drizzle-orm';
import type { Database } from '../../server/db/client';
import {
  enrollments,
  ensembles,
  instruments,
  ladderBenchmarks,
  ladderVersions,
  loans,
  passOffs,
  schoolYears,
  schools,
  studentAttainment,
  students,
  userSchools,
  users,
} from '../../server/db/schema/index';

/** The ids of the tiny invented district the report tests work on. */
/** A body for `POST /api/reports/send`: the report's kind and schools over November 2026 (the month the report tests read), and any more fields. */
export const novemberReport = (
  kind: 'director' | 'district',
  schoolIds: number[] | 'all-directors',
  more: object = {},
) => ({ kind, schoolIds, from: '2026-11-01', to: '2026-11-30', ...more });

export interface TinyDistrict {
  schoolIds: { HPMS: number; QHMS: number };
  studentIds: Record<string, number>;
}

/**
 * A tiny invented district, small enough to count by hand: two schools, seven active students
 * (and one withdrawn), a ladder with benchmarks, pass-offs inside and outside November 2026, and
 * a handful of instruments and loans. The expected figures are written out in the tests.
 */
export async function seedTinyDistrict(db: Database): Promise<TinyDistrict> {
  return db.transaction(async (tx) => {
    const [hpms, qhms] = await tx
      .insert(schools)
      .values([
        { code: 'HPMS', name: 'Heron Point Middle', level: 'middle' },
        { code: 'QHMS', name: 'Quarry Hill Middle', level: 'middle' },
      ])
      .returning({ id: schools.id });
    const [year] = await tx
      .insert(schoolYears)
      .values({ name: '2026-27', startsOn: '2026-08-17', endsOn: '2027-06-11', current: true })
      .returning({ id: schoolYears.id });
    const people = await tx
      .insert(users)
      .values([
        { email: 'coordinator@merrowbasin.example', name: 'Pat Coordinator', role: 'coordinator' },
        { email: 'director.hpms@merrowbasin.example', name: 'Lee Heron', role: 'director' },
        { email: 'director.qhms@merrowbasin.example', name: 'Sam Quarry', role: 'director' },
        { email: 'viewer.trhs@merrowbasin.example', name: 'Vic Viewer', role: 'viewer' },
        { email: 'student.hpms@merrowbasin.example', name: 'Ada Brook', role: 'student' },
      ])
      .returning({ id: users.id, email: users.email });
    const userId = (local: string) =>
      people.find((person) => person.email.startsWith(`${local}@`))!.id;
    await tx.insert(userSchools).values([
      { userId: userId('director.hpms'), schoolId: hpms!.id },
      { userId: userId('director.qhms'), schoolId: qhms!.id },
      { userId: userId('viewer.trhs'), schoolId: qhms!.id },
    ]);

    const roster = [
      { key: 'S1', school: hpms!.id, first: 'Ada', last: 'Brook', grade: 7 },
      { key: 'S2', school: hpms!.id, first: 'Ben', last: 'Cole', grade: 7 },
      { key: 'S3', school: hpms!.id, first: 'Cara', last: 'Dunn', grade: 8 },
      { key: 'S4', school: hpms!.id, first: 'Dev', last: 'Ellis', grade: 8 },
      // A name that a spreadsheet would run as a formula, to prove the CSV neutralises it.
      { key: 'S5', school: hpms!.id, first: 'Eve', last: 'Fox', grade: 6, preferred: '=1+1' },
      { key: 'S6', school: hpms!.id, first: 'Finn', last: 'Gray', grade: 7, withdrawn: true },
      { key: 'Q1', school: qhms!.id, first: 'Gia', last: 'Hart', grade: 7 },
      { key: 'Q2', school: qhms!.id, first: 'Hal', last: 'Ives', grade: 8 },
    ];
    const studentRows = await tx
      .insert(students)
      .values(
        roster.map((student) => ({
          studentNumber: `900${student.key}`,
          firstName: student.first,
          lastName: student.last,
          preferredName: student.preferred ?? null,
          grade: student.grade,
          schoolId: student.school,
          status: student.withdrawn ? ('withdrawn' as const) : ('active' as const),
        })),
      )
      .returning({ id: students.id, studentNumber: students.studentNumber });
    const studentIds = Object.fromEntries(
      studentRows.map((row) => [row.studentNumber.slice(3), row.id]),
    ) as Record<string, number>;
    const id = (key: string) => studentIds[key]!;

    const [concertBand, beginningBand, strings] = await tx
      .insert(ensembles)
      .values([
        { schoolId: hpms!.id, name: 'Concert Band', kind: 'concert-band' },
        { schoolId: hpms!.id, name: 'Beginning Band', kind: 'beginning-band' },
        { schoolId: qhms!.id, name: 'String Orchestra', kind: 'string-orchestra' },
      ])
      .returning({ id: ensembles.id });
    const seat = (key: string, ensembleId: number, instrumentId: string) => ({
      studentId: id(key),
      ensembleId,
      schoolYearId: year!.id,
      instrumentId,
    });
    await tx
      .insert(enrollments)
      .values([
        seat('S1', concertBand!.id, 'flute'),
        seat('S2', concertBand!.id, 'trumpet'),
        seat('S3', concertBand!.id, 'trumpet'),
        seat('S4', concertBand!.id, 'tuba'),
        seat('S5', beginningBand!.id, 'clarinet'),
        seat('S6', concertBand!.id, 'trumpet'),
        seat('Q1', strings!.id, 'violin'),
        seat('Q2', strings!.id, 'cello'),
      ]);

    const [ladder] = await tx
      .insert(ladderVersions)
      .values({ name: '2026 ladder', status: 'published', active: true })
      .returning({ id: ladderVersions.id });
    await tx.insert(ladderBenchmarks).values([
      { ladderVersionId: ladder!.id, grade: 7, rung: 1, byDate: '2026-08-17' },
      { ladderVersionId: ladder!.id, grade: 7, rung: 2, byDate: '2026-11-15' },
      { ladderVersionId: ladder!.id, grade: 8, rung: 3, byDate: '2026-09-01' },
    ]);
    const rungs: [string, number][] = [
      ['S1', 4],
      ['S2', 1],
      ['S3', 3],
      ['S5', 1],
      ['S6', 5],
      ['Q1', 2],
      ['Q2', 3],
    ];
    await tx
      .insert(studentAttainment)
      .values(
        rungs.map(([key, rung]) => ({ studentId: id(key), ladderVersionId: ladder!.id, rung })),
      )
      // Adding a student may already create its summary row.
      .onConflictDoUpdate({
        target: studentAttainment.studentId,
        set: { rung: sql`excluded.rung`, ladderVersionId: sql`excluded.ladder_version_id` },
      });
    const heard = (
      key: string,
      school: number,
      grade: number,
      code: string,
      heardOn: string,
      tempo: number,
      passed: boolean,
    ) => ({
      studentId: id(key),
      schoolId: school,
      grade,
      ladderVersionId: ladder!.id,
      requirementCode: code,
      heardOn,
      tempo,
      passed,
    });
    await tx
      .insert(passOffs)
      .values([
        heard('S2', hpms!.id, 7, 'r1-bb-major', '2026-10-01', 96, true),
        heard('S5', hpms!.id, 6, 'r1-bb-major', '2026-11-05', 80, true),
        heard('S5', hpms!.id, 6, 'r1-f-major', '2026-11-06', 84, true),
        heard('S1', hpms!.id, 7, 'r4-e-major', '2026-11-10', 120, true),
        heard('S3', hpms!.id, 8, 'r4-ab-major', '2026-11-20', 88, false),
        heard('S1', hpms!.id, 7, 'r5-b-major', '2026-12-01', 120, true),
        heard('Q1', qhms!.id, 7, 'r2-d-major', '2026-11-12', 100, true),
      ]);

    const fleet = await tx
      .insert(instruments)
      .values([
        { assetTag: 'HP-001', instrumentId: 'tuba', homeSchoolId: hpms!.id, status: 'on-loan' },
        { assetTag: 'HP-002', instrumentId: 'trumpet', homeSchoolId: hpms!.id, status: 'on-loan' },
        { assetTag: 'HP-003', instrumentId: 'flute', homeSchoolId: hpms!.id, status: 'in-repair' },
        {
          assetTag: 'HP-004',
          instrumentId: 'clarinet',
          homeSchoolId: hpms!.id,
          status: 'available',
        },
        { assetTag: 'QH-001', instrumentId: 'cello', homeSchoolId: qhms!.id, status: 'on-loan' },
      ])
      .returning({ id: instruments.id, assetTag: instruments.assetTag });
    const tag = (assetTag: string) => fleet.find((row) => row.assetTag === assetTag)!.id;
    await tx.insert(loans).values([
      {
        instrumentId: tag('HP-001'),
        studentId: id('S4'),
        schoolId: hpms!.id,
        checkedOutOn: '2026-09-01',
        dueOn: '2026-11-15',
        conditionOut: 'good',
      },
      {
        instrumentId: tag('HP-002'),
        studentId: id('S2'),
        schoolId: hpms!.id,
        checkedOutOn: '2026-09-01',
        dueOn: '2027-06-11',
        conditionOut: 'good',
        signedName: 'Jo Cole',
        signedAt: new Date('2026-09-02T16:00:00Z'),
      },
      {
        instrumentId: tag('HP-004'),
        studentId: id('S5'),
        schoolId: hpms!.id,
        checkedOutOn: '2026-09-01',
        dueOn: '2026-10-01',
        conditionOut: 'good',
        state: 'returned',
        returnedOn: '2026-10-01',
      },
      {
        instrumentId: tag('QH-001'),
        studentId: id('Q2'),
        schoolId: qhms!.id,
        checkedOutOn: '2026-09-01',
        dueOn: '2027-06-11',
        conditionOut: 'fair',
      },
    ]);
    await tx
      .update(users)
      .set({ studentId: id('S1') })
      .where(eq(users.id, userId('student.hpms')));
    return { schoolIds: { HPMS: hpms!.id, QHMS: qhms!.id }, studentIds };
  });
}
