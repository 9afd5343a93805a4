import { describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { ladderSchema } from '@shared/api/ladder';
import { currentRung } from '@shared/ladder/index';
import { rowsOf } from '../../server/db/client';
import { activeRuleLadder } from '../../server/ladder/ladder-queries';
import { familyOf, studentInstruments } from '../../server/ladder/student-families';
import { passOffsByStudent } from '../support/pass-off-records';
import { demoEmail, useTestApp } from '../support/test-app';

const app = useTestApp({ signIn: ['coordinator', 'director.hpms', 'student.hpms'] });
const { coordinator, 'director.hpms': director, 'student.hpms': student } = app.clients;

/** Every student's rung computed by the ladder rules from their raw pass-offs. */
async function rungsByRules(): Promise<Map<number, number>> {
  const db = app.database.db;
  const ladder = (await activeRuleLadder(db))!;
  const instruments = await studentInstruments(db);
  const byStudent = await passOffsByStudent(db);
  const students = rowsOf<{ id: number }>(await db.execute(sql`select id from students`));
  return new Map(
    students.map(({ id }) => [
      id,
      currentRung(ladder.rungs, byStudent.get(id) ?? [], familyOf(instruments.get(id))),
    ]),
  );
}

async function summaryRungs(): Promise<Map<number, number>> {
  const rows = rowsOf<{ student_id: number; rung: number }>(
    await app.database.db.execute(sql`select student_id, rung from student_attainment`),
  );
  return new Map(rows.map((row) => [row.student_id, row.rung]));
}

describe('Ladder', () => {
  it('should answer the active ladder with its rungs, requirements and benchmarks to every role that reads it', async () => {
    const response = await student.get('/api/ladder');
    expect(response.status).toBe(200);
    const ladder = ladderSchema.parse(response.body);
    expect(ladder.active).toBe(true);
    expect(ladder.status).toBe('published');
    expect(ladder.rungs).toHaveLength(7);
    expect(ladder.rungs.map((rung) => rung.number)).toEqual([1, 2, 3, 4, 5, 6, 7]);
    expect(ladder.rungs[0]!.title).toBe('Rung 1 — First scales');
    expect(ladder.rungs[0]!.requirements.find((item) => item.code === 'r1-bb-major')).toMatchObject(
      {
        tonic: 'Bb',
        mode: 'major',
        pattern: 'long-tones',
        tempo: 60,
        families: ['woodwind', 'brass', 'percussion'],
      },
    );
    expect(ladder.rungs[6]!.requirements.filter((item) => item.mode === 'major')).toHaveLength(12);
    expect(
      ladder.benchmarks
        .filter((benchmark) => benchmark.grade === 6)
        .map((benchmark) => benchmark.byDate),
    ).toEqual(['2027-01-31', '2027-05-31']);
    const technician = await app.signIn(demoEmail('technician'));
    expect((await technician.get('/api/ladder')).status).toBe(200);
  });

  it('should keep the summary rung of every demo student equal to the ladder rules on their pass-offs', async () => {
    const [expected, actual] = await Promise.all([rungsByRules(), summaryRungs()]);
    expect(expected.size).toBeGreaterThan(1000);
    expect(actual.size).toBe(expected.size);
    const disagreements = [...expected].filter(([id, rung]) => actual.get(id) !== rung);
    expect(disagreements).toEqual([]);
    expect(new Set(actual.values()).size).toBeGreaterThanOrEqual(6);
  });

  it('should refuse ladder changes from anyone but the coordinator', async () => {
    expect((await director.post('/api/ladder/versions', {})).status).toBe(403);
    expect((await student.post('/api/ladder/versions', {})).status).toBe(403);
    const versions = await director.get('/api/ladder/versions');
    expect(versions.status).toBe(200);
    expect(versions.body.rows.every((row: { status: string }) => row.status !== 'draft')).toBe(
      true,
    );
  });

  it('should copy the active version into a draft, validate edits, refuse stale ones and leave published versions alone', async () => {
    const active = (await coordinator.get('/api/ladder')).body;
    const created = await coordinator.post('/api/ladder/versions', {
      name: 'Ladder 2027–28 (draft)',
    });
    expect(created.status).toBe(201);
    expect(created.body.status).toBe('draft');
    expect(created.body.active).toBe(false);
    expect(created.body.rungs).toEqual(active.rungs);
    expect(created.body.benchmarks).toEqual(active.benchmarks);
    const draftId = created.body.id;
    expect((await director.get(`/api/ladder/versions/${draftId}`)).status).toBe(404);

    const bad = await coordinator.patch(`/api/ladder/versions/${draftId}`, {
      version: created.body.version,
      rungs: [
        {
          number: 1,
          title: 'Rung 1',
          requirements: [
            {
              code: 'x1',
              tonic: 'H',
              mode: 'major',
              pattern: 'long-tones',
              tempo: 20,
              articulation: 'tongued',
              octaves: 1,
              families: ['kazoo'],
            },
          ],
        },
        {
          number: 3,
          title: 'Rung 3',
          requirements: [
            {
              code: 'x1',
              tonic: 'C',
              mode: 'dorian',
              pattern: 'scale-sprint',
              tempo: 250,
              articulation: 'tongued',
              octaves: 3,
            },
          ],
        },
      ],
    });
    expect(bad.status).toBe(400);
    const fields = bad.body.error.fieldErrors.map((error: { field: string }) => error.field);
    expect(fields).toEqual(
      expect.arrayContaining([
        'rungs.0.requirements.0.tonic',
        'rungs.0.requirements.0.tempo',
        'rungs.0.requirements.0.families.0',
        'rungs.1.requirements.0.mode',
        'rungs.1.requirements.0.pattern',
        'rungs.1.requirements.0.tempo',
        'rungs.1.requirements.0.octaves',
      ]),
    );

    const misnumbered = await coordinator.patch(`/api/ladder/versions/${draftId}`, {
      version: created.body.version,
      rungs: [
        active.rungs[0],
        { ...active.rungs[1], number: 3, requirements: [active.rungs[0].requirements[0]] },
      ],
      benchmarks: [{ grade: 6, rung: 5, byDate: '2027-01-31' }],
    });
    expect(misnumbered.status).toBe(400);
    expect(
      misnumbered.body.error.fieldErrors.map((error: { field: string }) => error.field),
    ).toEqual(
      expect.arrayContaining([
        'rungs.1.number',
        'rungs.1.requirements.0.code',
        'benchmarks.0.rung',
      ]),
    );

    const edited = await coordinator.patch(`/api/ladder/versions/${draftId}`, {
      version: created.body.version,
      name: 'Ladder 2027–28',
      rungs: active.rungs.map(
        (rung: { number: number; requirements: { code: string; tempo: number }[] }) =>
          rung.number === 1
            ? { ...rung, requirements: rung.requirements.map((item) => ({ ...item, tempo: 66 })) }
            : rung,
      ),
    });
    expect(edited.status).toBe(200);
    expect(edited.body.version).toBe(created.body.version + 1);
    expect(
      edited.body.rungs[0].requirements.every((item: { tempo: number }) => item.tempo === 66),
    ).toBe(true);
    const stale = await coordinator.patch(`/api/ladder/versions/${draftId}`, {
      version: created.body.version,
      name: 'Overwritten',
    });
    expect(stale.status).toBe(409);
    expect((await coordinator.get(`/api/ladder/versions/${draftId}`)).body.name).toBe(
      'Ladder 2027–28',
    );

    const published = await coordinator.patch(`/api/ladder/versions/${active.id}`, {
      version: active.version,
      name: 'Changed in place',
    });
    expect(published.status).toBe(409);
    expect((await coordinator.get('/api/ladder')).body.name).toBe(active.name);
    expect((await coordinator.delete(`/api/ladder/versions/${active.id}`)).status).toBe(409);
    expect((await coordinator.delete(`/api/ladder/versions/${draftId}`)).status).toBe(204);
    expect((await coordinator.get(`/api/ladder/versions/${draftId}`)).status).toBe(404);
  });
});
