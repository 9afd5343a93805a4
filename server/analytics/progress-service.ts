import { eq } from 'drizzle-orm';
import type { StudentProgress } from '@shared/api/analytics';
import {
  benchmarksInForce,
  currentRung,
  metRequirements,
  nextRequirements,
  type PassOffRecord,
} from '@shared/ladder/index';
import type { Database } from '../db/client';
import { studentAttainment, students } from '../db/schema/index';
import { recomputeAttainment } from '../ladder/attainment';
import { notFound } from '../core/errors';
import type { Actor } from '../core/policy';
import { activeRuleLadder } from '../ladder/ladder-queries';
import { rungDropNote } from '../ladder/ladder-change';
import { familyOf, studentInstruments } from '../ladder/student-families';
import { maySeeStudent } from '../pass-offs/pass-off-rows';
import { passOffsOfStudent } from '../pass-offs/pass-offs-service';
import { today } from './analytics-scope';

/**
 * Brings the student's summary row up to date when it no longer matches what the rules say now
 * (a seat on another instrument changes the family, and seats change through the roster).
 */
async function healSummary(
  db: Database,
  studentId: number,
  now: { rung: number; family: string; versionId: number },
) {
  const [summary] = await db
    .select()
    .from(studentAttainment)
    .where(eq(studentAttainment.studentId, studentId));
  if (
    summary &&
    summary.rung === now.rung &&
    summary.family === now.family &&
    summary.ladderVersionId === now.versionId
  )
    return;
  await db.transaction((tx) => recomputeAttainment(tx, [studentId]));
}

/**
 * `GET /api/analytics/students/:id/progress`: the student's rung on the active ladder, what
 * they have met, what comes next, their pass-offs and recordings, and which no longer count.
 */
export async function studentProgress(
  db: Database,
  actor: Actor,
  studentId: number,
  asOf = today(),
): Promise<StudentProgress> {
  const [student] = await db.select().from(students).where(eq(students.id, studentId));
  if (!student || !maySeeStudent(actor, student)) throw notFound('That student');
  const ladder = await activeRuleLadder(db);
  if (!ladder) throw notFound('A published scale ladder');
  const [instrumentsByStudent, history] = await Promise.all([
    studentInstruments(db, [studentId]),
    passOffsOfStudent(db, studentId),
  ]);
  const instrumentId = instrumentsByStudent.get(studentId) ?? null;
  const family = familyOf(instrumentId);
  const records: PassOffRecord[] = history.map((passOff) => ({
    requirementId: passOff.requirementCode,
    tempo: passOff.tempo,
    passed: passOff.passed,
    heardOn: passOff.heardOn,
  }));
  const rung = currentRung(ladder.rungs, records, family);
  const next = nextRequirements(ladder.rungs, records, family);
  const nextCodes = new Set(next.requirements.map((requirement) => requirement.id));
  const nextRung = ladder.apiRungs.find((candidate) => candidate.number === next.rung);
  const benchmark = benchmarksInForce(ladder.benchmarks, asOf).get(student.grade);
  await healSummary(db, studentId, { rung, family, versionId: ladder.versionId });
  const ladderChange = await rungDropNote(db, ladder, records, family);
  return {
    studentId,
    studentName: `${student.preferredName ?? student.firstName} ${student.lastName}`,
    grade: student.grade,
    schoolId: student.schoolId,
    instrumentId,
    family: family || null,
    ladderVersionId: ladder.versionId,
    ladderVersionName: ladder.name,
    rungCount: ladder.rungs.length,
    rung,
    rungTitle: ladder.apiRungs.find((candidate) => candidate.number === rung)?.title ?? null,
    metRequirementCodes: [...metRequirements(ladder.rungs, records, family)],
    next: {
      rung: next.rung,
      title: nextRung?.title ?? null,
      requirements:
        nextRung?.requirements.filter((requirement) => nextCodes.has(requirement.code)) ?? [],
    },
    benchmark: benchmark
      ? { rung: benchmark.rung, byDate: benchmark.byDate, atOrAbove: rung >= benchmark.rung }
      : null,
    history,
    recordings: history.flatMap((passOff) =>
      passOff.recording ? [{ ...passOff.recording, passOffId: passOff.id }] : [],
    ),
    notes: history.flatMap((passOff) =>
      passOff.standing === 'below-tempo' || passOff.standing === 'requirement-gone'
        ? [{ passOffId: passOff.id, message: passOff.standingNote! }]
        : [],
    ),
    ladderChange,
  };
}
