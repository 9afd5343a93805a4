import { sql } from 'drizzle-orm';
import {
  benchmarksInForce,
  currentRung,
  type PassOffRecord,
  type Rung,
} from '@shared/ladder/index';
import type {
  Ladder,
  LadderBenchmark,
  LadderImpact,
  LadderImpactStudent,
} from '@shared/api/ladder';
import { rowsOf } from '../db/client';
import { conflict } from '../core/errors';
import { today } from '../analytics/analytics-scope';
import { activeRuleLadder, loadLadder, toRuleRungs, type Queryable } from './ladder-queries';
import { familyOf, studentInstruments } from './student-families';

interface StudentRow {
  id: number;
  student_number: string;
  first_name: string;
  preferred_name: string | null;
  last_name: string;
  grade: number;
  school_id: number;
  school_name: string;
  passes: string | null;
}

interface Standing extends LadderImpactStudent {
  schoolName: string;
}

/** Every active student with their fastest passes, as the ladder rules take them. */
async function activeStudents(db: Queryable) {
  const rows = rowsOf<StudentRow>(
    await db.execute(sql`
      select s.id, s.student_number, s.first_name, s.preferred_name, s.last_name, s.grade,
        s.school_id, sc.name as school_name,
        (select string_agg(r.requirement_code || ':' || r.best_tempo, ',')
           from passed_requirements r where r.student_id = s.id) as passes
      from students s join schools sc on sc.id = s.school_id
      where s.status = 'active'
      order by sc.name, s.grade, s.last_name, s.first_name, s.id`),
  );
  const instruments = await studentInstruments(db);
  return rows.map((row) => ({
    row,
    family: familyOf(instruments.get(row.id)),
    records: (row.passes?.split(',') ?? []).map((pass): PassOffRecord => {
      const [code, tempo] = pass.split(':');
      return { requirementId: code!, tempo: Number(tempo), passed: true, heardOn: '' };
    }),
  }));
}

function share(
  standings: readonly Standing[],
  benchmarks: readonly LadderBenchmark[],
  side: 'rungBefore' | 'rungAfter',
) {
  const inForce = benchmarksInForce(benchmarks, today());
  let counted = 0;
  let atOrAbove = 0;
  for (const standing of standings) {
    const benchmark = inForce.get(standing.grade);
    if (!benchmark) continue;
    counted += 1;
    if (standing[side] >= benchmark.rung) atOrAbove += 1;
  }
  return { counted, atOrAbove, share: counted ? atOrAbove / counted : null };
}

/**
 * The token that ties a publish or a restore to the impact the coordinator saw: the candidate's
 * row version and the version in force. Any edit of either since makes it stale.
 */
function impactToken(candidate: Ladder, activeId: number | null): string {
  return `${candidate.id}.${candidate.version}.${activeId ?? 0}`;
}

/** Each active student's rung now and under the candidate version. */
async function standingsUnder(db: Queryable, candidate: Ladder) {
  const active = await activeRuleLadder(db);
  const candidateRungs: Rung[] = toRuleRungs(candidate.rungs);
  const students = await activeStudents(db);
  const standings: Standing[] = students.map(({ row, family, records }) => ({
    studentId: row.id,
    studentNumber: row.student_number,
    name: `${row.preferred_name ?? row.first_name} ${row.last_name}`,
    schoolId: row.school_id,
    schoolName: row.school_name,
    grade: row.grade,
    rungBefore: active ? currentRung(active.rungs, records, family) : 0,
    rungAfter: currentRung(candidateRungs, records, family),
  }));
  return { active, standings };
}

/** Refuses a version that is in force already: it has no impact to show. */
function assertNotActive(candidate: Ladder): void {
  if (candidate.active) throw conflict('This version is the one in force; it changes no rung.');
}

/** What putting a version in force would do to every active student's rung and benchmark. */
export async function ladderImpact(db: Queryable, versionId: number): Promise<LadderImpact> {
  const candidate = await loadLadder(db, versionId);
  assertNotActive(candidate);
  const { active, standings } = await standingsUnder(db, candidate);
  const groups = new Map<string, LadderImpact['groups'][number]>();
  const totals = { up: 0, down: 0, same: 0 };
  for (const standing of standings) {
    const key = `${standing.schoolId}:${standing.grade}`;
    const group = groups.get(key) ?? {
      schoolId: standing.schoolId,
      schoolName: standing.schoolName,
      grade: standing.grade,
      up: 0,
      down: 0,
      same: 0,
    };
    const move = moveOf(standing);
    group[move] += 1;
    totals[move] += 1;
    groups.set(key, group);
  }
  return {
    versionId: candidate.id,
    versionName: candidate.name,
    activeVersionId: active?.versionId ?? null,
    activeVersionName: active?.name ?? null,
    ...totals,
    groups: [...groups.values()],
    benchmark: {
      before: share(standings, active?.benchmarks ?? [], 'rungBefore'),
      after: share(standings, candidate.benchmarks, 'rungAfter'),
    },
    token: impactToken(candidate, active?.versionId ?? null),
  };
}

function moveOf(standing: Standing): 'up' | 'down' | 'same' {
  if (standing.rungAfter > standing.rungBefore) return 'up';
  if (standing.rungAfter < standing.rungBefore) return 'down';
  return 'same';
}

/** The students behind one figure of the impact, by school, grade and move. */
export async function ladderImpactStudents(
  db: Queryable,
  versionId: number,
  filter: {
    schoolId?: number | undefined;
    grade?: number | undefined;
    move: 'up' | 'down' | 'same';
  },
): Promise<LadderImpactStudent[]> {
  const candidate = await loadLadder(db, versionId);
  assertNotActive(candidate);
  const { standings } = await standingsUnder(db, candidate);
  return standings
    .filter(
      (standing) =>
        moveOf(standing) === filter.move &&
        (filter.schoolId === undefined || standing.schoolId === filter.schoolId) &&
        (filter.grade === undefined || standing.grade === filter.grade),
    )
    .map(({ schoolName: _schoolName, ...student }) => student);
}

/**
 * Refuses a publish or restore whose impact was not seen, or was seen before the version or the
 * one in force changed (inside the caller's transaction, before anything is written).
 */
export async function assertImpactSeen(
  db: Queryable,
  candidate: Ladder,
  token: string,
): Promise<void> {
  const active = await activeRuleLadder(db);
  if (token !== impactToken(candidate, active?.versionId ?? null))
    throw conflict(
      'The ladder changed since its impact was shown; look at the impact again before putting it in force.',
    );
}
