import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sql } from 'drizzle-orm';
import { rowsOf } from '../../server/db/client';
import { migrationsFolder } from '../../server/project-paths';
import { publishSeen } from '../support/ladder-publish';
import { startTestApp, type TestApp } from '../support/test-app';
import { buildTinyDistrict, tinyStaff } from '../fixtures/ladder/tiny-district';

let app: TestApp;
let district: Awaited<ReturnType<typeof buildTinyDistrict>>;
let coordinator: ReturnType<TestApp['bearer']>;
let director: ReturnType<TestApp['bearer']>;

beforeAll(async () => {
  app = await startTestApp({ template: 'empty' });
  district = await buildTinyDistrict(app.database.db);
  [coordinator, director] = await Promise.all(
    [tinyStaff.coordinator, tinyStaff.hpmsDirector].map(async (email) =>
      app.bearer(await app.token(email)),
    ),
  );
});
afterAll(() => app?.close());

type LadderBody = {
  id: number;
  version: number;
  rungs: { number: number; requirements: { code: string; tempo: number; tonic: string }[] }[];
};

/** Each requirement's tempo in the ladder in force, as the API answers it. */
async function tempos(): Promise<Map<string, number>> {
  const ladder = (await coordinator.get('/api/ladder')).body as LadderBody;
  return new Map(
    ladder.rungs.flatMap((rung) => rung.requirements.map((item) => [item.code, item.tempo])),
  );
}

/**
 * The oracle: the active students with a passed pass-off at or above each requirement's tempo,
 * read from the pass-offs themselves (not from any summary table).
 */
async function fromPassOffs(codes: string[], minTempo?: number): Promise<number[]> {
  const inForce = await tempos();
  const wanted = Object.fromEntries(codes.map((code) => [code, minTempo ?? inForce.get(code)!]));
  return rowsOf<{ student_id: number }>(
    await app.database.db.execute(sql`
      select p.student_id from pass_offs p
      join students s on s.id = p.student_id and s.status = 'active'
      join json_each_text(${JSON.stringify(wanted)}::json) w on w.key = p.requirement_code
      where p.passed and p.tempo >= w.value::int
      group by p.student_id
      having count(distinct p.requirement_code) = ${codes.length}
      order by 1`),
  ).map((row) => row.student_id);
}

/** What the route lists (every page of it), its ids sorted. */
async function listed(codes: string[], minTempo?: number) {
  const query = `requirementCodes=${codes.join(',')}${minTempo ? `&minTempo=${minTempo}` : ''}`;
  const response = await coordinator.get(`/api/analytics/audition-ready?${query}&limit=200`);
  expect(response.status, JSON.stringify(response.body)).toBe(200);
  const ids = (response.body.rows as { id: number }[]).map((row) => row.id).sort((a, b) => a - b);
  expect(response.body.total).toBe(ids.length);
  return ids;
}

const questions: [codes: string[], minTempo?: number][] = [
  [['r1-bb-major']],
  [['r1-bb-major', 'r2-eb-major']],
  [['r2-eb-major', 'r1-bb-major'], 88],
  [['r1-bb-major', 'r1-d-major-strings']],
];

async function expectOracleAgrees(extra: typeof questions = []) {
  let found = 0;
  for (const [codes, minTempo] of [...questions, ...extra]) {
    const expected = await fromPassOffs(codes, minTempo);
    expect(await listed(codes, minTempo), JSON.stringify({ codes, minTempo })).toEqual(expected);
    found += expected.length;
  }
  // The questions find students, so the comparison is of real rows.
  expect(found).toBeGreaterThan(5);
}

/** The HPMS director records one passed pass-off; answers the status. */
async function hearPass(student: string, requirementCode: string, heardOn: string, tempo: number) {
  const response = await director.post('/api/pass-offs', {
    passOffs: [
      { studentId: district.studentId[student], requirementCode, heardOn, tempo, passed: true },
    ],
  });
  return response.status;
}

describe('Audition-ready against the pass-offs themselves', () => {
  it('should agree at the start, after new pass-offs and after a version that moves every requirement', async () => {
    await expectOracleAgrees();

    // s1 passes r2 at 84: now ready on r1 and r2 at their own tempos.
    expect(await hearPass('s1', 'r2-eb-major', '2026-11-30', 84)).toBe(201);
    await expectOracleAgrees();

    // A version with a requirement whose code sorts first (every stored position moves by one)
    // and a faster r2 tempo (those heard at 80 no longer qualify).
    const draft = (await coordinator.post('/api/ladder/versions', {})).body as LadderBody;
    const rungs = draft.rungs.map((rung) => ({
      ...rung,
      requirements: rung.requirements.flatMap((item) =>
        item.code === 'r1-bb-major'
          ? [{ ...item, code: 'r1-a-major', tonic: 'A' }, item]
          : item.code === 'r2-eb-major'
            ? [{ ...item, tempo: 84 }]
            : [item],
      ),
    }));
    const edited = await coordinator.patch(`/api/ladder/versions/${draft.id}`, {
      version: draft.version,
      rungs,
    });
    expect(edited.status, JSON.stringify(edited.body)).toBe(200);
    expect((await publishSeen(coordinator, draft.id, 'A major in rung 1')).status).toBe(200);
    expect((await tempos()).get('r2-eb-major')).toBe(84);
    expect(await hearPass('s5', 'r1-a-major', '2026-12-01', 60)).toBe(201);
    await expectOracleAgrees([[['r1-a-major', 'r2-eb-major']], [['r1-a-major']]]);
    expect(await listed(['r1-a-major', 'r2-eb-major'])).toEqual([district.studentId['s5']]);
  });

  it('should fill the stored tempos of an existing database as the summary writes them (migration 0012)', async () => {
    const { db } = app.database;
    const stored = async () =>
      rowsOf<{ student_id: number; best_tempos: number[] | null }>(
        await db.execute(
          sql`select student_id, best_tempos from student_attainment order by student_id`,
        ),
      );
    const written = await stored();
    expect(written.filter((row) => row.best_tempos?.some((tempo) => tempo !== null))).not.toEqual(
      [],
    );
    const migration = fs.readFileSync(
      path.join(migrationsFolder, '0012_attainment-best-tempos.sql'),
      'utf8',
    );
    const fill = migration
      .split('--> statement-breakpoint')
      .find((statement) => statement.includes('UPDATE "student_attainment"'));
    expect(fill).toBeDefined();
    await db.execute(sql`update student_attainment set best_tempos = null`);
    await db.execute(sql.raw(fill!));
    expect(await stored()).toEqual(written);
  });
});
