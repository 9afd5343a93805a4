import { beforeAll, describe, expect, it } from 'vitest';
import {
  ladderImpactSchema,
  ladderImpactStudentSchema,
  ladderSchema,
  type Ladder,
  type LadderRequirement,
} from '@shared/api/ladder';
import { studentProgressSchema } from '@shared/api/analytics';
import { currentRung, type PassOffRecord } from '@shared/ladder/index';
import { toRuleRungs } from '../../server/ladder/ladder-queries';
import { newRequirement as blankRequirement } from '../../web/app/ladder/ladder-editor/draft-model';
import { useTestApp } from '../support/test-app';

let ownStudentId: number;

const app = useTestApp({ signIn: ['coordinator', 'director.hpms', 'student.hpms'] });
const { coordinator, 'director.hpms': director, 'student.hpms': student } = app.clients;
beforeAll(async () => {
  ownStudentId = (await student.get('/api/me')).body.studentId;
});

/** A requirement no demo rung asks for, for one family: the editor's new requirement in C. */
function newRequirement(code: string, family: string): LadderRequirement {
  return { ...blankRequirement(), code, tonic: 'C', families: [family as 'strings'] };
}

async function freshDraft(): Promise<Ladder> {
  const response = await coordinator.post('/api/ladder/versions', {});
  expect(response.status).toBe(201);
  return ladderSchema.parse(response.body);
}

describe('Publishing a ladder version', () => {
  it('should show its impact by school and grade, publish only with that impact seen and under a name of its own, and tell a student whose rung dropped why', async () => {
    // The student passes every rung-1 requirement for their family, so they stand on rung 1 at least.
    const progress = studentProgressSchema.parse(
      (await director.get(`/api/analytics/students/${ownStudentId}/progress`)).body,
    );
    const family = progress.family!;
    const active = ladderSchema.parse((await coordinator.get('/api/ladder')).body);
    const rungOne = active.rungs[0]!.requirements.filter(
      (requirement) => !requirement.families || requirement.families.includes(family as 'strings'),
    );
    const heard = await director.post('/api/pass-offs', {
      passOffs: rungOne.map((requirement) => ({
        studentId: ownStudentId,
        requirementCode: requirement.code,
        heardOn: '2026-11-30',
        tempo: requirement.tempo,
        passed: true,
      })),
    });
    expect(heard.status).toBe(201);
    const standing = studentProgressSchema.parse(
      (await student.get(`/api/analytics/students/${ownStudentId}/progress`)).body,
    );
    expect(standing.rung).toBeGreaterThanOrEqual(1);
    expect(standing.ladderChange).toBeNull();

    // A draft adds C major for the student's family to rung 1.
    const draft = await freshDraft();
    expect(draft.name).toMatch(/\(draft\)/);
    const rungs = draft.rungs.map((rung) =>
      rung.number === 1
        ? {
            ...rung,
            requirements: [...rung.requirements, newRequirement('r1-c-major-new', family)],
          }
        : rung,
    );
    const edited = await coordinator.patch(`/api/ladder/versions/${draft.id}`, {
      version: draft.version,
      rungs,
    });
    expect(edited.status).toBe(200);

    // Nothing publishes blind.
    const blind = await coordinator.post(`/api/ladder/versions/${draft.id}/publish`, {});
    expect(blind.status).toBe(400);
    expect(blind.body.error.message).toBeTruthy();
    expect(JSON.stringify(blind.body)).toMatch(/impact/i);
    expect((await director.get(`/api/ladder/versions/${draft.id}/impact`)).status).toBe(403);

    const impactResponse = await coordinator.get(`/api/ladder/versions/${draft.id}/impact`);
    expect(impactResponse.status).toBe(200);
    const impact = ladderImpactSchema.parse(impactResponse.body);
    expect(impact.activeVersionId).toBe(active.id);
    // Each student is counted once: the groups add up to the totals.
    expect(impact.groups.reduce((sum, group) => sum + group.up + group.down + group.same, 0)).toBe(
      impact.up + impact.down + impact.same,
    );
    expect(impact.down).toBeGreaterThan(0);
    // Adding a requirement never lifts anyone.
    expect(impact.up).toBe(0);
    const ownGroup = impact.groups.find(
      (group) => group.schoolId === progress.schoolId && group.grade === progress.grade,
    )!;
    expect(ownGroup.down).toBeGreaterThanOrEqual(1);
    // The benchmark share can only fall when a requirement is added and the benchmarks stay.
    expect(impact.benchmark.after.atOrAbove).toBeLessThanOrEqual(impact.benchmark.before.atOrAbove);
    expect(impact.benchmark.after.counted).toBe(impact.benchmark.before.counted);

    // The drill-down names the students, and they are the ones the ladder rules move.
    const namesResponse = await coordinator.get(
      `/api/ladder/versions/${draft.id}/impact/students?schoolId=${progress.schoolId}&grade=${progress.grade}&move=down`,
    );
    expect(namesResponse.status).toBe(200);
    const names = namesResponse.body.rows.map((row: unknown) =>
      ladderImpactStudentSchema.parse(row),
    );
    expect(names).toHaveLength(ownGroup.down);
    const own = names.find((row: { studentId: number }) => row.studentId === ownStudentId)!;
    expect(own.name).toBe(progress.studentName);
    const records: PassOffRecord[] = rungOne.map((requirement) => ({
      requirementId: requirement.code,
      tempo: requirement.tempo,
      passed: true,
      heardOn: '2026-11-30',
    }));
    // The ladder rules themselves (shared/ladder) say the new rung-1 requirement stops them below rung 1.
    expect(own.rungAfter).toBe(0);
    expect(own.rungAfter).toBeLessThanOrEqual(currentRung(toRuleRungs(rungs), records, family));
    expect(own.rungBefore).toBe(standing.rung);
    expect(
      (await coordinator.get(`/api/ladder/versions/${draft.id}/impact/students?move=sideways`))
        .status,
    ).toBe(400);

    // A published version takes a name of its own.
    const unnamed = await coordinator.post(`/api/ladder/versions/${draft.id}/publish`, {
      impactToken: impact.token,
    });
    expect(unnamed.status).toBe(400);
    expect(unnamed.body.error.message).toMatch(/name of its own/);
    const marked = await coordinator.post(`/api/ladder/versions/${draft.id}/publish`, {
      impactToken: impact.token,
      name: 'Strings first (draft)',
    });
    expect(marked.status).toBe(400);
    const stale = await coordinator.post(`/api/ladder/versions/${draft.id}/publish`, {
      impactToken: `${draft.id}.0.${active.id}`,
      name: 'Strings first',
    });
    expect(stale.status).toBe(409);
    const published = await coordinator.post(`/api/ladder/versions/${draft.id}/publish`, {
      impactToken: impact.token,
      name: 'Strings first',
    });
    expect(published.status).toBe(200);
    expect(published.body).toMatchObject({ name: 'Strings first', active: true });
    expect((await student.get('/api/ladder')).body.name).toBe('Strings first');

    // The student and their director both read why the rung dropped.
    for (const reader of [student, director]) {
      const after = studentProgressSchema.parse(
        (await reader.get(`/api/analytics/students/${ownStudentId}/progress`)).body,
      );
      expect(after.rung).toBe(0);
      expect(after.ladderChange).toMatchObject({
        rungBefore: standing.rung,
        rungAfter: 0,
        previousVersionName: active.name,
        versionName: 'Strings first',
      });
      expect(after.ladderChange!.message).toMatch(
        /^The ladder changed on \d{1,2} \w+ \d{4}: C major for \w+ was added to rung 1/,
      );
    }

    // Roll back: the earlier version's impact, then it is in force again in one step.
    const back = ladderImpactSchema.parse(
      (await coordinator.get(`/api/ladder/versions/${active.id}/impact`)).body,
    );
    expect(back.up).toBe(impact.down);
    expect(back.down).toBe(0);
    expect((await coordinator.post(`/api/ladder/versions/${active.id}/restore`, {})).status).toBe(
      400,
    );
    expect(
      (
        await director.post(`/api/ladder/versions/${active.id}/restore`, {
          impactToken: back.token,
        })
      ).status,
    ).toBe(403);
    const restored = await coordinator.post(`/api/ladder/versions/${active.id}/restore`, {
      impactToken: back.token,
    });
    expect(restored.status).toBe(200);
    expect(restored.body).toMatchObject({ id: active.id, active: true, status: 'published' });
    const versions = (await coordinator.get('/api/ladder/versions')).body.rows;
    expect(versions.find((row: { id: number }) => row.id === draft.id)).toMatchObject({
      status: 'archived',
      active: false,
    });
    const rolledBack = studentProgressSchema.parse(
      (await student.get(`/api/analytics/students/${ownStudentId}/progress`)).body,
    );
    expect(rolledBack.rung).toBe(standing.rung);
    expect(rolledBack.ladderChange).toBeNull();
    // A draft is not something to roll back to.
    const another = await freshDraft();
    expect(
      (await coordinator.post(`/api/ladder/versions/${another.id}/restore`, { impactToken: 'x' }))
        .status,
    ).toBe(409);
  });

  it('should refuse a requirement that repeats another of the same rung, naming it', async () => {
    const draft = await freshDraft();
    const rungs = draft.rungs.map((rung) =>
      rung.number === 2
        ? {
            ...rung,
            requirements: [
              ...rung.requirements,
              { ...rung.requirements[0]!, code: 'r2-copy', tempo: rung.requirements[0]!.tempo + 8 },
            ],
          }
        : rung,
    );
    const refused = await coordinator.patch(`/api/ladder/versions/${draft.id}`, {
      version: draft.version,
      rungs,
    });
    expect(refused.status).toBe(400);
    const field = refused.body.error.fieldErrors.find((error: { field: string }) =>
      error.field.startsWith('rungs.1.requirements.'),
    );
    expect(field.message).toMatch(/Rung 2 already asks for this: requirement 1/);
    // Nothing changed.
    const unchanged = ladderSchema.parse(
      (await coordinator.get(`/api/ladder/versions/${draft.id}`)).body,
    );
    expect(unchanged.version).toBe(draft.version);
    // The same key for other families is a requirement of its own.
    expect(rungs[1]!.requirements[0]!.families).not.toEqual(['percussion', 'woodwind']);
    const accepted = await coordinator.patch(`/api/ladder/versions/${draft.id}`, {
      version: draft.version,
      rungs: rungs.map((rung, index) =>
        index !== 1
          ? rung
          : {
              ...rung,
              requirements: rung.requirements.map((requirement, at, all) =>
                at === all.length - 1
                  ? { ...requirement, families: ['woodwind' as const, 'percussion' as const] }
                  : requirement,
              ),
            },
      ),
    });
    expect(accepted.status).toBe(200);
  });
});
