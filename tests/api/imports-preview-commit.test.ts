import { describe, expect, it } from 'vitest';
import request from 'supertest';
import { expectCoordinatorOnly } from '../support/test-app';
import { csvOf, useImportsApp } from './imports-app';

const { app, coordinator, preview, previewAndCommit, query, tableCount, student } = useImportsApp();

describe('Roster imports API', () => {
  it('should answer 403 to every import route when the role is not coordinator', async () => {
    await expectCoordinatorOnly(app, (client) => [
      client.get('/api/imports'),
      client.get('/api/imports/1'),
      client.get('/api/imports/1/errors.csv'),
      client.post('/api/imports/commit', { importToken: 'a'.repeat(32) }),
      client.get('/api/imports/presets'),
      client.post('/api/imports/presets', { name: 'X', mapping: {} }),
      client.delete('/api/imports/presets/1'),
      preview(client, csvOf('IM-0001,Ada,Quill,,7,HPMS,,,,')),
    ]);
    expect((await app.anonymous.get('/api/imports')).status).toBe(401);
    expect(await student('IM-0001')).toBeUndefined();
  });

  it('should preview the rows, errors and plan and write nothing when a file is uploaded', async () => {
    const before = await Promise.all(
      ['students', 'roster_imports', 'ensembles', 'audit_log'].map(tableCount),
    );
    const file = csvOf(
      'IM-1001,Wren,Calloway,,6,HPMS,Concert Band,flute,,',
      'IM-1002,Odile,Marchetti,,13,HPMS,Concert Band,,,',
      'IM-1003,Soren,Achterberg,,K,FBES,Beginning Strings,violin,,',
    );
    const answer = await preview(coordinator, file);
    expect(answer.status).toBe(200);
    expect(answer.body.importToken).toMatch(/^[A-Za-z0-9_-]{16,64}$/);
    expect(answer.body.mapping.studentId).toBe('student_id');
    expect(answer.body.guessedMapping).toEqual(answer.body.mapping);
    expect(answer.body.totalRows).toBe(3);
    expect(answer.body.rows).toHaveLength(3);
    expect(answer.body.rows[1]).toMatchObject({
      line: 3,
      cells: { grade: '13', studentId: 'IM-1002' },
    });
    expect(answer.body.rows[1].errors).toEqual([
      { line: 3, column: 'grade', message: "Grade must be K or 1 to 12; got '13'." },
    ]);
    expect(answer.body.errors).toHaveLength(1);
    expect(answer.body.plan).toMatchObject({
      rows: 3,
      validRows: 2,
      created: 2,
      updated: 0,
      unchanged: 0,
      withdrawn: 0,
      createdStudentTotal: 2,
    });
    expect(
      answer.body.plan.createdStudents.map((entry: { studentId: string }) => entry.studentId),
    ).toEqual(['IM-1001', 'IM-1003']);
    const after = await Promise.all(
      ['students', 'roster_imports', 'ensembles', 'audit_log'].map(tableCount),
    );
    expect(after).toEqual(before);
  });

  it('should commit nothing when one row is bad, and the rest when skip-invalid is ticked', async () => {
    const file = csvOf(
      'IM-2001,Tamsin,Oakhurst,,7,QHMS,Concert Band,trumpet,Lior Oakhurst,lior.oakhurst@merrowbasin.example',
      'IM-2002,Bram,Hollings,,7,QHMS,Concert Band,kazoo,,',
      'IM-2003,Ines,Waterford,,8,QHMS,Symphonic Band,oboe,,',
    );
    const strict = await previewAndCommit(file);
    expect(strict.committed).toEqual({
      rows: 3,
      created: 2,
      updated: 0,
      unchanged: 0,
      withdrawn: 0,
      errors: [{ line: 3, column: 'instrument', message: expect.stringContaining("'kazoo'") }],
      committed: false,
    });
    expect(await student('IM-2001')).toBeUndefined();
    const [rejected] = await query<{ committed: boolean; via: string }>(
      `select committed, via from roster_imports order by id desc limit 1`,
    );
    expect(rejected).toEqual({ committed: false, via: 'wizard' });

    const lenient = await previewAndCommit(file, { skipInvalid: true });
    expect(lenient.committed).toMatchObject({ rows: 3, created: 2, committed: true });
    expect(lenient.committed.errors).toHaveLength(1);
    expect(await student('IM-2001')).toMatchObject({
      first_name: 'Tamsin',
      code: 'QHMS',
      guardian_email: 'lior.oakhurst@merrowbasin.example',
    });
    expect(await student('IM-2002')).toBeUndefined();
    const seats = await query<{ name: string; instrument_id: string }>(
      `select e.name, en.instrument_id from enrollments en join ensembles e on e.id = en.ensemble_id join students s on s.id = en.student_id where s.student_number = 'IM-2003'`,
    );
    expect(seats).toEqual([{ name: 'Symphonic Band', instrument_id: 'oboe' }]);
  });

  it('should report every row unchanged and write no audit entry but the summary when the same file comes again', async () => {
    const file = csvOf(
      'IM-3001,Maren,Castellane,Mar,9,TRHS,Wind Symphony,horn,Pia Castellane,pia.castellane@merrowbasin.example',
      'IM-3001,Maren,Castellane,Mar,9,TRHS,Marching Band,horn,Pia Castellane,pia.castellane@merrowbasin.example',
      'IM-3002,Dov,Esterhazy,,10,TRHS,,,,',
    );
    const first = await previewAndCommit(file);
    expect(first.committed).toMatchObject({
      rows: 3,
      created: 3,
      updated: 0,
      unchanged: 0,
      committed: true,
    });
    const versionBefore = (await student('IM-3001'))!.version;
    const auditBefore = await tableCount('audit_log');
    const second = await previewAndCommit(file);
    expect(second.previewed.plan).toMatchObject({
      created: 0,
      updated: 0,
      unchanged: 3,
      updatedStudentTotal: 0,
    });
    expect(second.committed).toEqual({
      rows: 3,
      created: 0,
      updated: 0,
      unchanged: 3,
      withdrawn: 0,
      errors: [],
      committed: true,
    });
    expect((await student('IM-3001'))!.version).toBe(versionBefore);
    const added = await query<{ action: string; entity: string }>(
      `select action, entity from audit_log order by id offset ${auditBefore}`,
    );
    expect(added).toEqual([{ action: 'import', entity: 'roster_import' }]);
  });

  it('should list each changed field with before and after and write it when a student changes', async () => {
    await previewAndCommit(
      csvOf(
        'IM-4001,Ansel,Brightmore,,6,HPMS,Concert Band,clarinet,Ruth Brightmore,ruth@merrowbasin.example',
      ),
    );
    const changed = csvOf(
      'IM-4001,Ansel,Brightmore,,7,QHMS,Concert Band,bass clarinet,Ruth Brightmore,ruth.brightmore@merrowbasin.example',
    );
    const { previewed, committed } = await previewAndCommit(changed);
    expect(previewed.plan.updatedStudents).toEqual([
      expect.objectContaining({
        studentId: 'IM-4001',
        changes: [
          { field: 'grade', before: '6', after: '7' },
          { field: 'schoolCode', before: 'HPMS', after: 'QHMS' },
          {
            field: 'guardianEmail',
            before: 'ruth@merrowbasin.example',
            after: 'ruth.brightmore@merrowbasin.example',
          },
          { field: 'ensemble', before: null, after: 'Concert Band' },
        ],
      }),
    ]);
    expect(committed).toMatchObject({ created: 0, updated: 1, unchanged: 0, committed: true });
    const row = await student('IM-4001');
    expect(row).toMatchObject({
      grade: 7,
      code: 'QHMS',
      guardian_email: 'ruth.brightmore@merrowbasin.example',
      version: 2,
    });
    const moves = await query<{ count: number }>(
      `select count(*)::int as count from school_moves where student_id = ${row!.id}`,
    );
    expect(moves[0]!.count).toBe(1);
    const audit = await query<{ before: { grade: number }; after: { grade: number } }>(
      `select before, after from audit_log where entity = 'student' and entity_id = '${row!.id}' and action = 'update'`,
    );
    expect(audit.map((entry) => [entry.before.grade, entry.after.grade])).toEqual([[6, 7]]);
  });

  it('should read an unmapped header and keep the mapping the coordinator chose', async () => {
    const file = Buffer.from(
      'Pupil Number,First Name,Last Name,Grade Level,School\nIM-6001,Lark,Penhallow,5,FBES\n',
    );
    const guessed = await preview(coordinator, file);
    expect(guessed.body.guessedMapping.studentId).toBeUndefined();
    expect(guessed.body.mappingProblems.map((problem: { field: string }) => problem.field)).toEqual(
      ['studentId'],
    );
    expect(guessed.body.plan.validRows).toBe(0);
    const mapping = { ...guessed.body.guessedMapping, studentId: 'Pupil Number' };
    const remapped = await request(app.url)
      .post('/api/imports/preview')
      .set({ Cookie: coordinator.cookie, Origin: app.url })
      .field('importToken', guessed.body.importToken)
      .field('mapping', JSON.stringify(mapping));
    expect(remapped.status).toBe(200);
    expect(remapped.body).toMatchObject({
      importToken: guessed.body.importToken,
      mappingProblems: [],
    });
    expect(remapped.body.plan.validRows).toBe(1);
    const { previewed, committed } = await previewAndCommit(file, { mapping });
    expect(previewed.mappingProblems).toEqual([]);
    expect(previewed.rows[0].cells).toMatchObject({ studentId: 'IM-6001', grade: '5' });
    expect(committed).toMatchObject({ created: 1, committed: true });
  });

  it('should list the history with the list contract and serve each import and its error report', async () => {
    const file = Buffer.from(
      'student_id,first_name,last_name,@grade,school_code\nIM-7001,Edda,Quarrington,=1+2,HPMS\n',
    );
    const mapping = {
      studentId: 'student_id',
      firstName: 'first_name',
      lastName: 'last_name',
      grade: '@grade',
      schoolCode: 'school_code',
    };
    await previewAndCommit(file, { mapping });
    const list = await coordinator.get('/api/imports?limit=2');
    expect(list.status).toBe(200);
    expect(list.body.total).toBeGreaterThanOrEqual(8);
    expect(list.body.rows).toHaveLength(2);
    const latest = list.body.rows[0];
    expect(latest).toMatchObject({
      fileName: 'roster.csv',
      via: 'wizard',
      committed: false,
      rows: 1,
      errorCount: 1,
      userName: expect.any(String),
    });
    const rejected = await coordinator.get('/api/imports?committed=false&limit=100');
    expect(rejected.body.rows.every((row: { committed: boolean }) => !row.committed)).toBe(true);
    const detail = await coordinator.get(`/api/imports/${latest.id}`);
    expect(detail.body.errors).toEqual([
      { line: 2, column: '@grade', message: "Grade must be K or 1 to 12; got '=1+2'." },
    ]);
    const report = await coordinator.get(`/api/imports/${latest.id}/errors.csv`);
    expect(report.status).toBe(200);
    expect(report.headers['content-type']).toContain('text/csv');
    expect(report.headers['content-disposition']).toContain('attachment');
    // OWASP "CSV Injection": cells starting with = + - @ get a single quote in front.
    expect(report.text.replace(/^\uFEFF/, '')).toBe(
      "line,column,message\r\n2,'@grade,Grade must be K or 1 to 12; got '=1+2'.\r\n",
    );
    expect((await coordinator.get('/api/imports/999999')).status).toBe(404);
    expect((await coordinator.get('/api/imports?sort=secret:asc')).status).toBe(400);
  });

  it('should save, replace, list and delete presets by name', async () => {
    const mapping = { studentId: 'Pupil Number', firstName: 'First Name' };
    const saved = await coordinator.post('/api/imports/presets', {
      name: 'Basin SIS export',
      mapping,
    });
    expect(saved.status).toBe(201);
    const replaced = await coordinator.post('/api/imports/presets', {
      name: 'Basin SIS export',
      mapping: { ...mapping, grade: 'Grade Level' },
    });
    expect(replaced.body.id).toBe(saved.body.id);
    const list = await coordinator.get('/api/imports/presets');
    expect(
      list.body.rows.filter((row: { name: string }) => row.name === 'Basin SIS export'),
    ).toEqual([expect.objectContaining({ mapping: { ...mapping, grade: 'Grade Level' } })]);
    expect((await coordinator.post('/api/imports/presets', { name: '', mapping })).status).toBe(
      400,
    );
    expect((await coordinator.delete(`/api/imports/presets/${saved.body.id}`)).status).toBe(204);
    expect((await coordinator.delete(`/api/imports/presets/${saved.body.id}`)).status).toBe(404);
  });

  it('should refuse a commit whose upload is not kept, and an upload over 20 MB', async () => {
    const unknown = await coordinator.post('/api/imports/commit', { importToken: 'x'.repeat(32) });
    expect(unknown.status).toBe(410);
    const tooLarge = await preview(coordinator, Buffer.alloc(20 * 1024 * 1024 + 1, 0x41));
    expect(tooLarge.status).toBe(413);
    expect(tooLarge.body.error.message).toContain('20 MB');
    const noFile = await request(app.url)
      .post('/api/imports/preview')
      .set({ Cookie: coordinator.cookie, Origin: app.url })
      .field('withdrawMissing', 'false');
    expect(noFile.status).toBe(400);
  });
});
