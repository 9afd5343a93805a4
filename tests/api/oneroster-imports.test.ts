import { readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import { strToU8, zipSync } from 'fflate';
import request from 'supertest';
import { sql } from 'drizzle-orm';
import { describe, expect, it } from 'vitest';
import { rowsOf } from '../../server/db/client';
import {
  allButCoordinator,
  expectCoordinatorOnly,
  useTestApp,
  type SignedInClient,
} from '../support/test-app';

const fixtures = path.resolve('tests/fixtures/rosters');

/** A fixture bundle folder as a zip, with some of its files changed. */
function bundle(folder: string, change: Record<string, (text: string) => string> = {}): Buffer {
  const entries: Record<string, Uint8Array> = {};
  for (const name of readdirSync(path.join(fixtures, folder))) {
    const text = readFileSync(path.join(fixtures, folder, name), 'utf8');
    entries[name] = strToU8(change[name] ? change[name](text) : text);
  }
  return Buffer.from(zipSync(entries));
}

function preview(file: Buffer, fileName = 'export.zip') {
  return coordinator.upload('/api/imports/preview', 'file', file, fileName);
}

async function commit(file: Buffer, options: { skipInvalid?: boolean } = {}) {
  const previewed = await preview(file);
  expect(previewed.status).toBe(200);
  const committed = await coordinator.post('/api/imports/commit', {
    importToken: previewed.body.importToken,
    withdrawMissing: false,
    skipInvalid: options.skipInvalid ?? false,
  });
  expect(committed.status).toBe(200);
  return { previewed: previewed.body, committed: committed.body };
}

function putMapping(client: SignedInClient, body: object) {
  return request(app.url)
    .put('/api/oneroster/org-mappings')
    .set({ Cookie: client.cookie, Origin: app.url })
    .send(body);
}

interface StudentState {
  student_number: string;
  status: string;
  preferred_name: string | null;
  code: string;
  seats: string[] | null;
}

/** The students with these numbers: status, school and the ensembles they are seated in now. */
async function students(...numbers: string[]): Promise<StudentState[]> {
  return rowsOf<StudentState>(
    await app.database.db.execute(sql`
      select s.student_number, s.status, s.preferred_name, sc.code,
        (select array_agg(e.name order by e.name) from enrollments en
           join ensembles e on e.id = en.ensemble_id
           join school_years y on y.id = en.school_year_id and y.current
         where en.student_id = s.id and en.active) as seats
      from students s join schools sc on sc.id = s.school_id
      where s.student_number = any(${sql.param(numbers)}::text[])
      order by s.student_number collate "C"`),
  );
}

/** A student as `students()` reads them: active with no preferred name unless `more` says otherwise. */
function studentState(
  student_number: string,
  code: string,
  seats: string[] | null,
  more: Partial<StudentState> = {},
): StudentState {
  return { student_number, status: 'active', preferred_name: null, code, seats, ...more };
}

const app = useTestApp({ signIn: ['coordinator', ...allButCoordinator] }, 120_000);
const { coordinator } = app.clients;

describe('OneRoster bundle imports', () => {
  it('should answer 403 to the org mapping routes when the role is not coordinator', async () => {
    await expectCoordinatorOnly(app, (client) => [
      client.get('/api/oneroster/org-mappings'),
      putMapping(client, { sourcedId: 'org-x', orgName: 'X', schoolId: 1 }),
      client.delete('/api/oneroster/org-mappings/org-x'),
    ]);
  });

  it('should show an org that matches no school, and read it once the coordinator maps it', async () => {
    const renamed = bundle('oneroster-1.2-bundle', {
      'orgs.csv': (text) => text.replace('Quarry Hill Middle', 'QH Campus North'),
    });
    const first = await preview(renamed);
    expect(first.status).toBe(200);
    expect(first.body.oneRoster).toMatchObject({
      version: '1.2',
      delta: false,
      unmappedOrgs: [
        { sourcedId: 'org-qh', name: 'QH Campus North', identifier: '', type: 'school' },
      ],
    });
    expect(first.body.errors).toEqual([
      {
        line: 5,
        column: 'orgs.csv:identifier',
        message:
          "Org 'QH Campus North' (sourcedId 'org-qh', no identifier) matches no school of the district by identifier, saved mapping or name; choose its school in the import's mapping step.",
      },
    ]);
    const [quarryHill] = rowsOf<{ id: number }>(
      await app.database.db.execute(sql`select id from schools where code = 'QHMS'`),
    );
    const bad = await putMapping(coordinator, { sourcedId: 'org qh', orgName: 'QH', schoolId: 0 });
    expect(bad.status).toBe(400);
    const chosen = await putMapping(coordinator, {
      sourcedId: 'org-qh',
      orgName: 'QH Campus North',
      schoolId: quarryHill!.id,
    });
    expect(chosen.status).toBe(200);
    expect(chosen.body).toMatchObject({ sourcedId: 'org-qh', schoolCode: 'QHMS', chosen: true });
    const second = await preview(renamed);
    expect(second.body.errors).toEqual([]);
    expect(second.body.oneRoster.unmappedOrgs).toEqual([]);
    // Forgotten again, so the import below matches it by name.
    expect((await coordinator.delete('/api/oneroster/org-mappings/org-qh')).status).toBe(204);
    expect((await coordinator.delete('/api/oneroster/org-mappings/org-qh')).status).toBe(404);
  });

  it('should import a 1.2 bulk bundle, then apply a delta without withdrawing students it leaves out', async () => {
    const bulk = await commit(bundle('oneroster-1.2-bundle'));
    expect(bulk.previewed.oneRoster).toEqual({
      version: '1.2',
      delta: false,
      skipped: 7,
      unmappedOrgs: [],
    });
    expect(bulk.committed).toMatchObject({
      rows: 5,
      created: 5,
      withdrawn: 0,
      errors: [],
      committed: true,
    });
    expect(await students('mary.jones', 'teo+b@hp', 'Ines.H', 'li.wei', 'gone.student')).toEqual([
      studentState('Ines.H', 'QHMS', ['String Orchestra']),
      studentState('li.wei', 'HPMS', null),
      studentState('mary.jones', 'HPMS', ['Flute Choir', 'Symphonic Winds'], {
        preferred_name: 'Molly',
      }),
      studentState('teo+b@hp', 'HPMS', ['Symphonic Winds']),
    ]);
    const mappings = await coordinator.get('/api/oneroster/org-mappings');
    expect(
      mappings.body.rows.map((row: { sourcedId: string; schoolCode: string; chosen: boolean }) => [
        row.sourcedId,
        row.schoolCode,
        row.chosen,
      ]),
    ).toEqual([
      ['org-hp', 'HPMS', false],
      ['org-hp-music', 'HPMS', false],
      ['org-qh', 'QHMS', false],
    ]);

    const delta = await commit(bundle('oneroster-1.2-delta'));
    expect(delta.previewed.oneRoster).toMatchObject({ version: '1.2', delta: true });
    expect(
      delta.previewed.plan.withdrawnStudents.map((row: { studentId: string }) => row.studentId),
    ).toEqual(['teo+b@hp']);
    expect(delta.committed).toMatchObject({
      rows: 2,
      created: 1,
      withdrawn: 1,
      errors: [],
      committed: true,
    });
    expect(await students('mary.jones', 'teo+b@hp', 'Ines.H', 'li.wei', 'ada.k')).toEqual([
      studentState('Ines.H', 'QHMS', ['String Orchestra']),
      studentState('ada.k', 'HPMS', ['Symphonic Winds']),
      studentState('li.wei', 'HPMS', null),
      studentState('mary.jones', 'HPMS', ['Symphonic Winds'], { preferred_name: 'Mae' }),
      studentState('teo+b@hp', 'HPMS', null, { status: 'withdrawn' }),
    ]);
  });

  it('should read a delta without orgs.csv through the orgs remembered from the bulk import', async () => {
    const files = bundle('oneroster-1.2-delta', {
      'manifest.csv': (text) => text.replace('file.orgs,bulk', 'file.orgs,absent'),
      'orgs.csv': () => 'sourcedId,name,type\r\n',
    });
    const answer = await preview(files);
    expect(answer.body.errors).toEqual([]);
  });
});
