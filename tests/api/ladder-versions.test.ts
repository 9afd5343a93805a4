import { beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { studentProgressSchema } from '@shared/api/analytics';
import { currentRung } from '@shared/ladder/index';
import { rowsOf } from '../../server/db/client';
import { activeRuleLadder } from '../../server/ladder/ladder-queries';
import { familyOf, studentInstruments } from '../../server/ladder/student-families';
import { publishSeen } from '../support/ladder-publish';
import { passOffsByStudent } from '../support/pass-off-records';
import { useTestApp } from '../support/test-app';

let ownStudentId: number;

const app = useTestApp({ signIn: ['coordinator', 'director.hpms', 'student.hpms'] });
const { coordinator, 'director.hpms': director, 'student.hpms': student } = app.clients;
beforeAll(async () => {
  ownStudentId = (await student.get('/api/me')).body.studentId;
});

describe('Ladder versions', () => {
  it('should keep old pass-offs under their version and say which no longer count once a new version is published', async () => {
    const before = (await coordinator.get('/api/ladder')).body;
    const heard = await director.post('/api/pass-offs', {
      passOffs: [
        {
          studentId: ownStudentId,
          requirementCode: 'r1-bb-major',
          heardOn: '2026-11-30',
          tempo: 60,
          passed: true,
        },
        {
          studentId: ownStudentId,
          requirementCode: 'r1-eb-major',
          heardOn: '2026-11-30',
          tempo: 60,
          passed: true,
        },
        {
          studentId: ownStudentId,
          requirementCode: 'r1-f-major',
          heardOn: '2026-11-30',
          tempo: 72,
          passed: true,
        },
      ],
    });
    expect(heard.status).toBe(201);
    expect(
      heard.body.rows.every(
        (row: { standing: string; ladderVersionId: number }) =>
          row.standing === 'counts' && row.ladderVersionId === before.id,
      ),
    ).toBe(true);

    const draft = (await coordinator.post('/api/ladder/versions', {})).body;
    const rungs = draft.rungs.map(
      (rung: { number: number; requirements: { code: string; tempo: number }[] }) =>
        rung.number !== 1
          ? rung
          : {
              ...rung,
              requirements: rung.requirements.map((item) =>
                item.code === 'r1-bb-major'
                  ? { ...item, code: 'r1-bb-major-slurred', articulation: 'slurred' }
                  : item.code === 'r1-eb-major'
                    ? { ...item, tempo: 66 }
                    : item,
              ),
            },
    );
    const edited = await coordinator.patch(`/api/ladder/versions/${draft.id}`, {
      version: draft.version,
      rungs,
    });
    expect(edited.status).toBe(200);
    expect((await director.post(`/api/ladder/versions/${draft.id}/publish`)).status).toBe(403);
    const published = await publishSeen(coordinator, draft.id, 'Rung 1 slurred');
    expect(published.status).toBe(200);
    expect(published.body).toMatchObject({ id: draft.id, status: 'published', active: true });

    const active = (await student.get('/api/ladder')).body;
    expect(active.id).toBe(draft.id);
    const versions = (await coordinator.get('/api/ladder/versions')).body.rows;
    expect(versions.find((row: { id: number }) => row.id === before.id)).toMatchObject({
      status: 'archived',
      active: false,
    });

    const progress = studentProgressSchema.parse(
      (await student.get(`/api/analytics/students/${ownStudentId}/progress`)).body,
    );
    const standing = (code: string) =>
      progress.history.find((row) => row.heardOn === '2026-11-30' && row.requirementCode === code)!;
    expect(standing('r1-bb-major')).toMatchObject({
      standing: 'requirement-gone',
      ladderVersionId: before.id,
    });
    expect(standing('r1-eb-major')).toMatchObject({
      standing: 'below-tempo',
      ladderVersionId: before.id,
    });
    expect(standing('r1-f-major').standing).toBe('counts');
    const noteIds = progress.notes.map((note) => note.passOffId);
    expect(noteIds).toEqual(
      expect.arrayContaining([standing('r1-bb-major').id, standing('r1-eb-major').id]),
    );
    expect(noteIds).not.toContain(standing('r1-f-major').id);
    expect(
      progress.notes.find((note) => note.passOffId === standing('r1-bb-major').id)!.message,
    ).toMatch(/no longer counts/);
    expect(progress.metRequirementCodes).not.toContain('r1-bb-major');

    const other = await coordinator.get(`/api/analytics/students/${ownStudentId}/progress`);
    expect(other.body.rung).toBe(progress.rung);
    expect((await student.get(`/api/analytics/students/${ownStudentId + 1}/progress`)).status).toBe(
      404,
    );
  });

  it('should rebuild every student’s rung against the new version so the summary still agrees with the rules', async () => {
    const db = app.database.db;
    const ladder = (await activeRuleLadder(db))!;
    const instruments = await studentInstruments(db);
    const byStudent = await passOffsByStudent(db);
    const summary = rowsOf<{ student_id: number; rung: number; ladder_version_id: number }>(
      await db.execute(sql`select student_id, rung, ladder_version_id from student_attainment`),
    );
    expect(summary.length).toBeGreaterThan(1000);
    expect(summary.every((row) => row.ladder_version_id === ladder.versionId)).toBe(true);
    const disagreements = summary.filter(
      (row) =>
        row.rung !==
        currentRung(
          ladder.rungs,
          byStudent.get(row.student_id) ?? [],
          familyOf(instruments.get(row.student_id)),
        ),
    );
    expect(disagreements).toEqual([]);
    // Renaming r1-bb-major took rung 1 away from every wind player who had not passed the new code.
    const [windsOnRungOne] = rowsOf<{ count: number }>(
      await db.execute(
        sql`select count(*)::int as count from student_attainment where rung >= 1 and family in ('woodwind', 'brass', 'percussion')`,
      ),
    );
    expect(windsOnRungOne!.count).toBe(0);
  });
});
