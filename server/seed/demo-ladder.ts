import { sql } from 'drizzle-orm';
import type { Transaction } from '../db/client';
import { rowsOf } from '../db/client';
import { ladderVersions, passOffs } from '../db/schema/index';
import type { LadderBenchmark, LadderRequirement, LadderRung } from '../../shared/api/ladder';
import type { Articulation, PatternId } from '../../shared/music/index';
import { appliesTo } from '../../shared/ladder/index';
import { rebuildAttainment } from '../ladder/attainment';
import { toRuleRungs, writeLadderContent } from '../ladder/ladder-queries';
import { familyOf, studentInstruments } from '../ladder/student-families';
import { insertInBatches } from './demo-roster';
import { SeededRandom } from './random';

const winds = ['woodwind', 'brass', 'percussion'] as LadderRequirement['families'];
const strings = ['strings'] as LadderRequirement['families'];
const twelveMajors = ['C', 'G', 'D', 'A', 'E', 'B', 'F#', 'Db', 'Ab', 'Eb', 'Bb', 'F'];

function requirements(
  rung: number,
  tonics: string[],
  shape: { pattern: PatternId; tempo: number; articulation: Articulation; octaves?: 1 | 2 },
  families: LadderRequirement['families'],
  extra: { mode?: LadderRequirement['mode']; optional?: boolean; suffix?: string } = {},
): LadderRequirement[] {
  const mode = extra.mode ?? 'major';
  return tonics.map((tonic) => ({
    code: `r${rung}-${tonic.toLowerCase().replace('#', 's')}-${mode}${extra.suffix ?? ''}`,
    tonic,
    mode,
    pattern: shape.pattern,
    tempo: shape.tempo,
    articulation: shape.articulation,
    octaves: shape.octaves ?? 1,
    optional: extra.optional ?? false,
    families,
  }));
}

/** The invented Merrow Basin ladder: seven rungs from long tones at ♩ = 60 to all twelve majors. */
export const demoLadderRungs: LadderRung[] = [
  {
    number: 1,
    title: 'Rung 1 — First scales',
    requirements: [
      ...requirements(1, ['Bb', 'Eb', 'F'], { pattern: 'long-tones', tempo: 60, articulation: 'tongued' }, winds),
      ...requirements(1, ['D', 'A', 'G'], { pattern: 'long-tones', tempo: 60, articulation: 'tongued' }, strings),
    ],
  },
  {
    number: 2,
    title: 'Rung 2 — Scales in motion',
    requirements: [
      ...requirements(2, ['Bb', 'Eb', 'F'], { pattern: 'cycle-broad', tempo: 72, articulation: 'tongued' }, winds),
      ...requirements(2, ['D', 'A', 'G'], { pattern: 'cycle-broad', tempo: 72, articulation: 'tongued' }, strings),
      ...requirements(2, ['C'], { pattern: 'long-tones', tempo: 60, articulation: 'tongued' }, null, { mode: 'chromatic', optional: true }),
    ],
  },
  {
    number: 3,
    title: 'Rung 3 — Slurs and arpeggios',
    requirements: [
      ...requirements(3, ['C'], { pattern: 'cycle-broad', tempo: 80, articulation: 'slurred' }, null),
      ...requirements(3, ['Ab'], { pattern: 'cycle-broad', tempo: 80, articulation: 'slurred' }, winds),
      ...requirements(3, ['Bb'], { pattern: 'arpeggio-long', tempo: 80, articulation: 'slurred' }, winds, { suffix: '-arpeggio' }),
      ...requirements(3, ['E'], { pattern: 'cycle-broad', tempo: 80, articulation: 'slurred' }, strings),
      ...requirements(3, ['D'], { pattern: 'arpeggio-long', tempo: 80, articulation: 'slurred' }, strings, { suffix: '-arpeggio' }),
    ],
  },
  {
    number: 4,
    title: 'Rung 4 — New keys',
    requirements: [
      ...requirements(4, ['Db', 'G', 'D'], { pattern: 'cycle-broad', tempo: 92, articulation: 'tongue-up-slur-down' }, winds),
      ...requirements(4, ['F', 'Bb'], { pattern: 'cycle-broad', tempo: 92, articulation: 'tongue-up-slur-down' }, strings),
      ...requirements(4, ['C'], { pattern: 'cycle-broad', tempo: 92, articulation: 'slurred' }, null, { mode: 'chromatic' }),
    ],
  },
  {
    number: 5,
    title: 'Rung 5 — Two octaves',
    requirements: [
      ...requirements(5, ['Bb', 'F', 'Eb'], { pattern: 'cycle-broad', tempo: 100, articulation: 'tongued', octaves: 2 }, winds),
      ...requirements(5, ['D', 'G', 'A'], { pattern: 'cycle-broad', tempo: 100, articulation: 'tongued', octaves: 2 }, strings),
      ...requirements(5, ['Ab'], { pattern: 'cycle-broad', tempo: 100, articulation: 'tongued', octaves: 2 }, winds, { optional: true }),
    ],
  },
  {
    number: 6,
    title: 'Rung 6 — Brisk cycles',
    requirements: [
      ...requirements(6, ['Bb', 'Eb', 'F', 'Ab', 'C', 'Db', 'G'], { pattern: 'cycle-brisk', tempo: 108, articulation: 'tongue-up-slur-down' }, winds),
      ...requirements(6, ['D', 'A', 'G', 'C', 'F', 'Bb', 'E'], { pattern: 'cycle-brisk', tempo: 108, articulation: 'tongue-up-slur-down' }, strings, { suffix: '-strings' }),
      ...requirements(6, ['C'], { pattern: 'cycle-brisk', tempo: 108, articulation: 'slurred', octaves: 2 }, null, { mode: 'chromatic', optional: true }),
    ],
  },
  {
    number: 7,
    title: 'Rung 7 — All twelve',
    requirements: [
      ...requirements(7, twelveMajors, { pattern: 'cycle-brisk', tempo: 120, articulation: 'tongued' }, null),
      ...requirements(7, ['C'], { pattern: 'cycle-brisk', tempo: 120, articulation: 'slurred', octaves: 2 }, null, { mode: 'chromatic' }),
      ...requirements(7, ['C'], { pattern: 'cycle-brisk', tempo: 144, articulation: 'slurred', octaves: 2 }, null, { mode: 'chromatic', optional: true, suffix: '-144' }),
    ],
  },
];

const midYear = [[4, 0], [5, 1], [6, 1], [7, 2], [8, 3], [9, 3], [10, 4], [11, 5], [12, 6]] as const;

/** Mid-year (31 January) and year-end (31 May) benchmarks for grades 4 to 12. */
export const demoBenchmarks: LadderBenchmark[] = midYear.flatMap(([grade, rung]) => [
  { grade, rung, byDate: '2027-01-31' },
  { grade, rung: rung + 1, byDate: '2027-05-31' },
]);

/** How far each grade has climbed by December, as weights over rungs (invented). */
const targetsByGrade: Record<number, [number, number][]> = {
  4: [[0, 40], [1, 45], [2, 15]],
  5: [[0, 15], [1, 35], [2, 35], [3, 15]],
  6: [[0, 15], [1, 40], [2, 30], [3, 15]],
  7: [[1, 15], [2, 35], [3, 35], [4, 15]],
  8: [[2, 15], [3, 35], [4, 35], [5, 15]],
  9: [[2, 10], [3, 30], [4, 40], [5, 20]],
  10: [[3, 15], [4, 35], [5, 35], [6, 15]],
  11: [[4, 15], [5, 35], [6, 35], [7, 15]],
  12: [[4, 10], [5, 30], [6, 35], [7, 25]],
};

const notes = ['', '', '', '', 'Steady air through the top note.', 'Watch the descending accidentals.', 'Good tone; keep the tempo honest.', 'Rushed the arpeggio a little.', 'Try again after more slow practice.'];

const dayMs = 24 * 60 * 60 * 1000;
const isoDay = (time: number) => new Date(time).toISOString().slice(0, 10);
function weekday(time: number): number {
  const day = new Date(time).getUTCDay();
  return day === 6 ? time - dayMs : day === 0 ? time + dayMs : time;
}

interface DemoStudent {
  id: number;
  school_id: number;
  grade: number;
  code: string;
}

/**
 * Seeds the demo ladder (published and active) and a school year of pass-offs for every active
 * demo student, heard by their school's director, then builds the attainment summary.
 */
export async function seedDemoLadder(tx: Transaction, context: { directorOf: Map<string, number> }) {
  // Its own sequence, so the roster and the other seeders come out the same with or without it.
  const random = new SeededRandom(20260824);
  const [accounts] = rowsOf<{ coordinator: number | null; student: number | null }>(
    await tx.execute(sql`select (select min(id) from users where role = 'coordinator') as coordinator,
      (select min(student_id) from users where role = 'student') as student`),
  );
  const studentAccountStudentId = accounts?.student ?? null;
  const [version] = await tx
    .insert(ladderVersions)
    .values({ name: 'Merrow Basin scale ladder 2026–27', status: 'published', active: true, publishedAt: new Date('2026-08-10T16:00:00Z'), createdBy: accounts?.coordinator ?? null })
    .returning({ id: ladderVersions.id });
  await writeLadderContent(tx, version!.id, { rungs: demoLadderRungs, benchmarks: demoBenchmarks });
  const requirementIds = new Map(
    rowsOf<{ id: number; code: string }>(await tx.execute(sql`select id, code from ladder_requirements where ladder_version_id = ${version!.id}`)).map((row) => [row.code, row.id]),
  );
  const ruleRungs = toRuleRungs(demoLadderRungs);
  const pupils = rowsOf<DemoStudent>(
    await tx.execute(sql`select s.id, s.school_id, s.grade::int as grade, sc.code from students s join schools sc on sc.id = s.school_id where s.status = 'active' order by s.id`),
  );
  const instruments = await studentInstruments(tx);
  const rows: (typeof passOffs.$inferInsert)[] = [];
  const yearStart = Date.parse('2026-08-24T00:00:00Z');
  for (const pupil of pupils) {
    const family = familyOf(instruments.get(pupil.id));
    const own = pupil.id === studentAccountStudentId;
    const target = own ? 2 : random.weighted(targetsByGrade[pupil.grade] ?? [[0, 1]]);
    const events: { code: string; tempo: number; passed: boolean }[] = [];
    for (const rung of ruleRungs) {
      if (rung.number > target + 1) break;
      const partial = rung.number === target + 1;
      for (const requirement of rung.requirements.filter((candidate) => appliesTo(candidate, family))) {
        const attempt = partial ? random.next() : requirement.optional ? (random.chance(0.3) ? 0.9 : 0) : 0.9;
        if (partial && attempt > 0.7) continue;
        if (random.chance(own ? 0.5 : 0.22) || (partial && attempt > 0.4)) {
          events.push({ code: requirement.id, tempo: requirement.tempo - random.pick([0, 0, 4, 8]), passed: false });
        }
        if (partial ? attempt <= 0.4 : attempt > 0) {
          events.push({ code: requirement.id, tempo: requirement.tempo + random.pick([0, 0, 0, 4, 8]), passed: true });
        }
      }
    }
    if (events.length === 0) continue;
    const stalled = pupil.code === 'OMMS' || random.chance(0.12);
    const start = yearStart + random.integer(0, 12) * dayMs;
    const end = Date.parse(stalled ? '2026-09-25T00:00:00Z' : '2026-11-06T00:00:00Z') + random.integer(0, stalled ? 28 : 24) * dayMs;
    const directorId = context.directorOf.get(pupil.code) ?? null;
    events.forEach((event, index) => {
      const heardOn = isoDay(weekday(start + Math.round(((end - start) * (index + 1)) / (events.length + 1) / dayMs) * dayMs));
      rows.push({
        studentId: pupil.id,
        schoolId: pupil.school_id,
        grade: pupil.grade,
        ladderVersionId: version!.id,
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
  await insertInBatches(rows, 5000, (batch) =>
    tx.execute(sql`
      insert into pass_offs (student_id, school_id, grade, ladder_version_id, requirement_id, requirement_code, heard_on, tempo, passed, heard_by, note)
      select x."studentId", x."schoolId", x.grade, x."ladderVersionId", x."requirementId", x."requirementCode", x."heardOn", x.tempo, x.passed, x."heardBy", x.note
      from json_to_recordset(${JSON.stringify(batch)}::json) as x("studentId" int, "schoolId" int, grade smallint, "ladderVersionId" int,
        "requirementId" int, "requirementCode" text, "heardOn" date, tempo smallint, passed boolean, "heardBy" int, note text)`),
  );
  await rebuildAttainment(tx);
}
