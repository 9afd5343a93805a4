import { sql } from 'drizzle-orm';
import type { Transaction } from '../db/client';
import { rowsOf } from '../db/client';
import { ladderVersions, passOffs } from '../db/schema/index';
import { appliesTo } from '@shared/ladder/index';
import { rebuildAttainment } from '../ladder/attainment';
import { toRuleRungs, writeLadderContent } from '../ladder/ladder-queries';
import { familyOf, studentInstruments } from '../ladder/student-families';
import { insertInBatches } from './demo-roster';
import { demoBenchmarks, demoLadderRungs } from './demo-ladder-rungs';
import { SeededRandom } from './random';

/** How far each grade has climbed by December, as weights over rungs (invented). */
export const targetsByGrade: Record<number, [number, number][]> = {
  4: [
    [0, 40],
    [1, 45],
    [2, 15],
  ],
  5: [
    [0, 15],
    [1, 35],
    [2, 35],
    [3, 15],
  ],
  6: [
    [0, 15],
    [1, 40],
    [2, 30],
    [3, 15],
  ],
  7: [
    [1, 15],
    [2, 35],
    [3, 35],
    [4, 15],
  ],
  8: [
    [2, 15],
    [3, 35],
    [4, 35],
    [5, 15],
  ],
  9: [
    [2, 10],
    [3, 30],
    [4, 40],
    [5, 20],
  ],
  10: [
    [3, 15],
    [4, 35],
    [5, 35],
    [6, 15],
  ],
  11: [
    [4, 15],
    [5, 35],
    [6, 35],
    [7, 15],
  ],
  12: [
    [4, 10],
    [5, 30],
    [6, 35],
    [7, 25],
  ],
};

const notes = [
  '',
  '',
  '',
  '',
  'Steady air through the top note.',
  'Watch the descending accidentals.',
  'Good tone; keep the tempo honest.',
  'Rushed the arpeggio a little.',
  'Try again after more slow practice.',
];

const dayMs = 24 * 60 * 60 * 1000;
const isoDay = (time: number) => new Date(time).toISOString().slice(0, 10);
/**
 * A school day near `time`: Saturday goes back to Friday, Sunday on to Monday (or, when that is
 * past `last`, back to Friday).
 */
export function weekday(time: number, last: number): number {
  const day = new Date(time).getUTCDay();
  if (day === 6) return time - dayMs;
  if (day === 0) return time + dayMs > last ? time - 2 * dayMs : time + dayMs;
  return time;
}

/** The demo was first seeded on 1 December 2026; its pass-offs never end before 30 November. */
const firstLastDay = Date.parse('2026-11-30T00:00:00Z');

/**
 * The last day the demo's pass-offs fall on: the day before the demo is seeded, but not before
 * 30 November 2026 nor after the school year's last day. The pass-offs end there, so the demo
 * reads as a year in progress (pass-offs this week, few students stalled) on whatever day it
 * is tried, and the same day seeds the same district.
 */
export function lastDemoPassOffDay(seededOn: Date, schoolYearEndsOn: string): number {
  const dayBefore =
    Date.UTC(seededOn.getUTCFullYear(), seededOn.getUTCMonth(), seededOn.getUTCDate()) - dayMs;
  return Math.min(Math.max(dayBefore, firstLastDay), Date.parse(`${schoolYearEndsOn}T00:00:00Z`));
}

interface DemoStudent {
  id: number;
  school_id: number;
  grade: number;
  code: string;
}

/** The demo ladder, published and active; answers its id and its requirements' ids by code. */
async function seedLadderVersion(tx: Transaction) {
  const [accounts] = rowsOf<{ coordinator: number | null; student: number | null }>(
    await tx.execute(sql`select (select min(id) from users where role = 'coordinator') as coordinator,
      (select min(student_id) from users where role = 'student') as student`),
  );
  const studentAccountStudentId = accounts?.student ?? null;
  const [version] = await tx
    .insert(ladderVersions)
    .values({
      name: 'Merrow Basin scale ladder 2026–27',
      status: 'published',
      active: true,
      publishedAt: new Date('2026-08-10T16:00:00Z'),
      createdBy: accounts?.coordinator ?? null,
    })
    .returning({ id: ladderVersions.id });
  const versionId = version!.id;
  await writeLadderContent(tx, versionId, { rungs: demoLadderRungs, benchmarks: demoBenchmarks });
  const requirementIds = new Map(
    rowsOf<{ id: number; code: string }>(
      await tx.execute(
        sql`select id, code from ladder_requirements where ladder_version_id = ${versionId}`,
      ),
    ).map((row) => [row.code, row.id]),
  );
  return { versionId, requirementIds, studentAccountStudentId };
}

type PassOffEvent = { code: string; tempo: number; passed: boolean };

/**
 * One student's pass-offs, in order: every requirement of the rungs up to `target` (optional ones
 * about one in three), some first heard too slow, and part of the next rung.
 */
function pupilEvents(
  random: SeededRandom,
  ruleRungs: ReturnType<typeof toRuleRungs>,
  family: ReturnType<typeof familyOf>,
  target: number,
  own: boolean,
): PassOffEvent[] {
  const events: PassOffEvent[] = [];
  for (const rung of ruleRungs) {
    if (rung.number > target + 1) break;
    const partial = rung.number === target + 1;
    for (const requirement of rung.requirements.filter((candidate) =>
      appliesTo(candidate, family),
    )) {
      const attempt = partial
        ? random.next()
        : requirement.optional
          ? random.chance(0.3)
            ? 0.9
            : 0
          : 0.9;
      if (partial && attempt > 0.7) continue;
      if (random.chance(own ? 0.5 : 0.22) || (partial && attempt > 0.4)) {
        events.push({
          code: requirement.id,
          tempo: requirement.tempo - random.pick([0, 0, 4, 8]),
          passed: false,
        });
      }
      if (partial ? attempt <= 0.4 : attempt > 0) {
        events.push({
          code: requirement.id,
          tempo: requirement.tempo + random.pick([0, 0, 0, 4, 8]),
          passed: true,
        });
      }
    }
  }
  return events;
}

/**
 * Seeds the demo ladder (published and active) and a school year of pass-offs for every active
 * demo student, heard by their school's director on school days, then builds the attainment
 * summary. Each student's pass-offs are spread evenly from late August to their last one: within
 * the 24 days up to {@link lastDemoPassOffDay} for students who are moving, 38 to 66 days before
 * it for stalled ones (all of one school and about one in eight elsewhere).
 */
export async function seedDemoLadder(
  tx: Transaction,
  context: { directorOf: Map<string, number>; schoolYearEndsOn: string; seededOn: Date },
) {
  // Its own sequence, so the roster and the other seeders come out the same with or without it.
  const random = new SeededRandom(20260824);
  const { versionId, requirementIds, studentAccountStudentId } = await seedLadderVersion(tx);
  const ruleRungs = toRuleRungs(demoLadderRungs);
  const pupils = rowsOf<DemoStudent>(
    await tx.execute(
      sql`select s.id, s.school_id, s.grade::int as grade, sc.code from students s join schools sc on sc.id = s.school_id where s.status = 'active' order by s.id`,
    ),
  );
  const instruments = await studentInstruments(tx);
  const rows: (typeof passOffs.$inferInsert)[] = [];
  const yearStart = Date.parse('2026-08-24T00:00:00Z');
  const lastDay = lastDemoPassOffDay(context.seededOn, context.schoolYearEndsOn);
  for (const pupil of pupils) {
    const family = familyOf(instruments.get(pupil.id));
    const own = pupil.id === studentAccountStudentId;
    const target = own ? 2 : random.weighted(targetsByGrade[pupil.grade] ?? [[0, 1]]);
    const events = pupilEvents(random, ruleRungs, family, target, own);
    if (events.length === 0) continue;
    const stalled = pupil.code === 'OMMS' || random.chance(0.12);
    const start = yearStart + random.integer(0, 12) * dayMs;
    const end =
      lastDay - (stalled ? 66 : 24) * dayMs + random.integer(0, stalled ? 28 : 24) * dayMs;
    const directorId = context.directorOf.get(pupil.code) ?? null;
    events.forEach((event, index) => {
      const heardOn = isoDay(
        weekday(
          start + Math.round(((end - start) * (index + 1)) / events.length / dayMs) * dayMs,
          lastDay,
        ),
      );
      rows.push({
        studentId: pupil.id,
        schoolId: pupil.school_id,
        grade: pupil.grade,
        ladderVersionId: versionId,
        requirementId: requirementIds.get(event.code)!,
        requirementCode: event.code,
        heardOn,
        tempo: event.tempo,
        passed: event.passed,
        heardBy: directorId,
        note: event.passed ? random.pick(notes.slice(0, 7)) : random.pick(notes.slice(4)),
      });
    });
  }
  await insertPassOffRows(tx, rows);
  await rebuildAttainment(tx);
}

/**
 * Lands the demo's pass-offs, 5,000 rows a statement, each batch one JSON parameter unpacked by
 * PostgreSQL's `json_to_recordset` ("JSON Functions and Operators").
 */
export async function insertPassOffRows(tx: Transaction, rows: object[]): Promise<void> {
  await insertInBatches(rows, 5000, (batch) =>
    tx.execute(sql`
      insert into pass_offs (student_id, school_id, grade, ladder_version_id, requirement_id, requirement_code, heard_on, tempo, passed, heard_by, note)
      select x."studentId", x."schoolId", x.grade, x."ladderVersionId", x."requirementId", x."requirementCode", x."heardOn", x.tempo, x.passed, x."heardBy", x.note
      from json_to_recordset(${JSON.stringify(batch)}::json) as x("studentId" int, "schoolId" int, grade smallint, "ladderVersionId" int,
        "requirementId" int, "requirementCode" text, "heardOn" date, tempo smallint, passed boolean, "heardBy" int, note text)`),
  );
}
