import { describe, expect, it } from 'vitest';
import request from 'supertest';
import { rowsOf } from '../../server/db/client';
import { importUndoPreviewSchema } from '@shared/api/import';
import { allButCoordinator, expectCoordinatorOnly, useTestApp } from '../support/test-app';

const header =
  'student_id,first_name,last_name,grade,school_code,ensemble,instrument,guardian_name,guardian_email';

function csvOf(...lines: string[]): Buffer {
  return Buffer.from(`${[header, ...lines].join('\r\n')}\r\n`);
}

/** Previews and commits a roster as the wizard does; answers the history row's id. */
async function importFile(file: Buffer, withdrawMissing = false): Promise<number> {
  const previewed = await request(app.url)
    .post('/api/imports/preview')
    .set({ Cookie: coordinator.cookie, Origin: app.url })
    .field('withdrawMissing', String(withdrawMissing))
    .attach('file', file, 'roster.csv');
  expect(previewed.status).toBe(200);
  const committed = await coordinator.post('/api/imports/commit', {
    importToken: previewed.body.importToken,
    withdrawMissing,
    skipInvalid: false,
  });
  expect(committed.status).toBe(200);
  expect(committed.body.committed).toBe(true);
  const history = await coordinator.get('/api/imports?sort=createdAt:desc&limit=1');
  return history.body.rows[0].id;
}

async function query<Row>(text: string): Promise<Row[]> {
  return rowsOf<Row>(await app.database.db.execute(text as never));
}

/** Every student, seat and ensemble as the roster holds them, to compare before and after. */
async function rosterState() {
  return {
    students: await query(
      `select student_number, first_name, last_name, preferred_name, grade, school_id, status,
         guardian_name, guardian_email from students order by student_number`,
    ),
    seats: await query(
      `select s.student_number, en.ensemble_id, en.school_year_id, en.instrument_id, en.active
       from enrollments en join students s on s.id = en.student_id
       order by s.student_number, en.ensemble_id, en.school_year_id`,
    ),
    ensembles: await query(`select id, school_id, name from ensembles order by id`),
  };
}

const app = useTestApp({ signIn: ['coordinator', ...allButCoordinator] });
const { coordinator } = app.clients;

describe('Undoing a roster import', () => {
  it('should answer 403 to every role but the coordinator and 404 for an unknown import', async () => {
    await expectCoordinatorOnly(app, (client) => [
      client.get('/api/imports/1/undo'),
      client.post('/api/imports/1/undo', {}),
    ]);
    expect((await coordinator.get('/api/imports/999999/undo')).status).toBe(404);
    expect((await coordinator.post('/api/imports/999999/undo', {})).status).toBe(404);
    expect((await coordinator.get('/api/imports/abc/undo')).status).toBe(400);
  });

  it('should put the roster back exactly as it was when the last import is undone', async () => {
    await importFile(
      csvOf(
        'UN-3001,Ansel,Brightwater,6,FBES,Beginning Band,flute,Mara Brightwater,mara@example.org',
        'UN-3002,Bette,Okonkwo-Lind,5,FBES,Beginning Band,clarinet,,',
        'UN-3003,Cato,Ferreira,5,FBES,Beginning Strings,violin,,',
      ),
    );
    const before = await rosterState();
    const fbesActive = await query<{ count: number }>(
      `select count(*)::int as count from students s join schools sc on sc.id = s.school_id
       where sc.code = 'FBES' and s.status = 'active'`,
    );

    // A new student, a changed grade and guardian, a move between ensembles, a new instrument,
    // a new ensemble, and every other active student of the school withdrawn.
    const importId = await importFile(
      csvOf(
        'UN-3001,Ansel,Brightwater,6,FBES,Beginning Band,flute,Mara Brightwater-Hale,mara.hale@example.org',
        'UN-3002,Bette,Okonkwo-Lind,5,FBES,Beginning Strings,cello,,',
        'UN-3003,Cato,Ferreira,5,FBES,Beginning Strings,viola,,',
        'UN-3004,Dagny,Ruiz,4,FBES,Recorder Consort,flute,,',
      ),
      true,
    );
    expect(await rosterState()).not.toEqual(before);

    const previewed = await coordinator.get(`/api/imports/${importId}/undo`);
    expect(previewed.status).toBe(200);
    const undo = importUndoPreviewSchema.parse(previewed.body);
    expect(undo).toMatchObject({
      importId,
      studentsRemoved: 1,
      studentsRestored: 1,
      withdrawalsReversed: fbesActive[0]!.count - 3,
      ensemblesRemoved: 1,
      blockers: [],
      canUndo: true,
    });
    // UN-3002's new seat and her ended one, UN-3003's instrument, and the withdrawn students'
    // seats.
    expect(undo.seatsRestored).toBeGreaterThanOrEqual(3);
    // The preview writes nothing.
    expect(await rosterState()).not.toEqual(before);

    const undone = await coordinator.post(`/api/imports/${importId}/undo`, {});
    expect(undone.status).toBe(200);
    expect(undone.body.undoneAt).toEqual(expect.any(String));
    expect(await rosterState()).toEqual(before);

    const history = await coordinator.get(`/api/imports/${importId}`);
    expect(history.body.undoneAt).toBe(undone.body.undoneAt);
    const [audit] = await query<{ action: string }>(
      `select action from audit_log where entity = 'roster_import' and entity_id = '${importId}'
       and action = 'undo'`,
    );
    expect(audit?.action).toBe('undo');

    const again = await coordinator.post(`/api/imports/${importId}/undo`, {});
    expect(again.status).toBe(409);
    expect(again.body.error.message).toMatch(/already undone/);
  });

  it('should refuse, name what blocks it and change nothing when work recorded since depends on it', async () => {
    const importId = await importFile(
      csvOf(
        'UN-4001,Edda,Marlow,7,QHMS,Concert Band,trumpet,,',
        'UN-4002,Fenn,Aldous,7,QHMS,Concert Band,horn,,',
      ),
    );
    // Two pass-offs heard for a student the import created.
    for (let heard = 0; heard < 2; heard++)
      await query(
        `insert into pass_offs (student_id, school_id, grade, ladder_version_id, requirement_id,
           requirement_code, heard_on, tempo, passed)
         select s.id, s.school_id, s.grade, p.ladder_version_id, p.requirement_id,
           p.requirement_code, p.heard_on, p.tempo, p.passed
         from students s, (select * from pass_offs limit 1) p where s.student_number = 'UN-4001'`,
      );
    const state = await rosterState();
    const previewed = await coordinator.get(`/api/imports/${importId}/undo`);
    expect(previewed.body.canUndo).toBe(false);
    expect(previewed.body.blockers).toEqual([
      '2 pass-offs have since been recorded on students this import created.',
    ]);
    const refused = await coordinator.post(`/api/imports/${importId}/undo`, {});
    expect(refused.status).toBe(409);
    expect(refused.body.error.message).toContain(
      '2 pass-offs have since been recorded on students this import created.',
    );
    expect(await rosterState()).toEqual(state);
  });

  it('should refuse an import that a later one of the same school follows, or one past the window', async () => {
    const first = await importFile(csvOf('UN-5001,Gil,Haverford,9,TRHS,Concert Band,tuba,,'));
    const second = await importFile(csvOf('UN-5002,Hana,Iwu,9,TRHS,Concert Band,tuba,,'));
    const blocked = await coordinator.get(`/api/imports/${first}/undo`);
    expect(blocked.body.blockers).toEqual([
      expect.stringMatching(
        /^A later import \(“roster\.csv”, \d{4}-\d\d-\d\d\) wrote the same schools; undo that one first\.$/,
      ),
    ]);
    // An import of another school does not stand in the way.
    await importFile(csvOf('UN-5003,Ivo,Jansen,7,HPMS,Concert Band,flute,,'));
    expect((await coordinator.get(`/api/imports/${second}/undo`)).body.canUndo).toBe(true);

    await query(
      `update roster_imports set created_at = now() - interval '8 days' where id = ${second}`,
    );
    const late = await coordinator.get(`/api/imports/${second}/undo`);
    expect(late.body.blockers).toEqual([
      expect.stringMatching(/^An import can be undone for 7 days; this one ran on /),
    ]);
    expect((await coordinator.post(`/api/imports/${second}/undo`, {})).status).toBe(409);
  });

  it('should refuse when a student the import changed has been edited since', async () => {
    const importId = await importFile(csvOf('UN-5001,Gil,Haverford,10,TRHS,Concert Band,tuba,,'));
    await query(
      `update students set preferred_name = 'Gilly', version = version + 1 where student_number = 'UN-5001'`,
    );
    const previewed = await coordinator.get(`/api/imports/${importId}/undo`);
    expect(previewed.body.blockers).toEqual(['1 student this import wrote has been edited since.']);
  });

  it('should answer 400 and undo nothing when the undo is sent fields', async () => {
    const importId = await importFile(csvOf('UN-6001,Jo,Kestrel,8,HPMS,Concert Band,oboe,,'));
    const answer = await coordinator.post(`/api/imports/${importId}/undo`, { force: true });
    expect(answer.status).toBe(400);
    expect((await coordinator.get(`/api/imports/${importId}/undo`)).body.canUndo).toBe(true);
  });
});
