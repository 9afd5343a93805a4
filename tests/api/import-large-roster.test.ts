import { describe, expect, it } from 'vitest';
import { settleUnfinishedImports } from '../../server/imports/landed-students';
import type { RosterRow } from '@shared/roster';
import { inventedRoster } from '../bench/roster-import';
import type { TestApp } from '../support/test-app';
import {
  expectHistoryToFail,
  importInSteps,
  query,
  rosterState,
  studentsState,
  useTwoDistricts,
} from './import-differences-app';

// The same imports run in two districts, one committing with the short cut (only the rows the
// plan found different) and one comparing every row again.
const districts = useTwoDistricts();

describe('A large roster import', () => {
  // Some rows name an ensemble no school has yet. More new students than a bulk load's least,
  // fewer than four times the roster: written with every index in place.
  const largeFile = inventedRoster(4_800, 9, 830_000).map((row, index) =>
    index % 7 === 0 ? { ...row, ensemble: 'Landing Strings' } : row,
  );
  const largeFileStudents = new Set(largeFile.map((row) => row.studentId)).size;
  const studentsOfFile = async (app: TestApp, rows: RosterRow[]) =>
    (
      await query<{ count: number }>(
        app,
        `select count(*)::int as count from students
         where student_number in (${[...new Set(rows.map((row) => `'${row.studentId}'`))].join(', ')})`,
      )
    )[0]!.count;
  const landingRows = async (app: TestApp) =>
    (
      await query<{ count: number }>(
        app,
        'select count(*)::int as count from roster_import_landings',
      )
    )[0]!.count;

  it('should add its new students in its one transaction, and end where comparing every row ends', async () => {
    const { one: shortCut, other: everyRow } = districts;
    expect(largeFileStudents).toBeGreaterThan(4_000);
    const counts = (app: TestApp) =>
      query<{ code: string; grade: number; status: string; students: number }>(
        app,
        `select c.code, n.grade, n.status, n.students from student_counts n
         join schools c on c.id = n.school_id order by 1, 2, 3`,
      );
    const countsBefore = await Promise.all([counts(shortCut), counts(everyRow)]);
    const withShortCut = await importInSteps(shortCut, largeFile);
    const comparingAll = await importInSteps(everyRow, largeFile, () =>
      query(everyRow, `select nextval('roster_generation')`),
    );
    expect(withShortCut.result).toMatchObject({ committed: true, created: largeFile.length });
    expect(comparingAll.result).toEqual({
      ...withShortCut.result,
      importId: comparingAll.result.importId,
    });
    expect(await studentsState(shortCut, 'S83')).toEqual(await studentsState(everyRow, 'S83'));
    const lastSummary = async (app: TestApp) => (await rosterState(app)).imports.at(-1);
    expect(await lastSummary(shortCut)).toEqual(await lastSummary(everyRow));
    expect((await lastSummary(shortCut))!['summary']).toMatchObject({
      newEnsembles: expect.arrayContaining(['Landing Strings']),
    });
    // The per-school counts moved by the same amounts in both.
    const added = async (app: TestApp, before: Awaited<ReturnType<typeof counts>>) =>
      (await counts(app)).map((row) => ({
        ...row,
        students:
          row.students -
          (before.find(
            (old) => old.code === row.code && old.grade === row.grade && old.status === row.status,
          )?.students ?? 0),
      }));
    expect(await added(shortCut, countsBefore[0])).toEqual(await added(everyRow, countsBefore[1]));
    if (shortCut.database.kind === 'pglite') {
      // Nothing is written ahead of the transaction that commits, and no index is dropped.
      expect(withShortCut.transactions).toBe(1);
      expect(comparingAll.transactions).toBe(1);
      expect(withShortCut.droppedIndexes).toBe(0);
    }
  });

  it('should leave no student, ensemble or count behind when its transaction fails', async () => {
    const { one: shortCut } = districts;
    const file = inventedRoster(2_400, 10, 840_000).map((row) => ({
      ...row,
      ensemble: row.ensemble ? `${row.ensemble} Taken Back` : row.ensemble,
    }));
    const ensemblesBefore = await query(shortCut, 'select id from ensembles order by id');
    const countsBefore = await query(
      shortCut,
      'select school_id, grade, status, students from student_counts order by 1, 2, 3',
    );
    await expectHistoryToFail(shortCut, () => importInSteps(shortCut, file));
    expect(await studentsOfFile(shortCut, file)).toBe(0);
    expect(await query(shortCut, 'select id from ensembles order by id')).toEqual(ensemblesBefore);
    expect(
      await query(
        shortCut,
        'select school_id, grade, status, students from student_counts order by 1, 2, 3',
      ),
    ).toEqual(countsBefore);
  });

  // Imports once landed new students ahead of their final transaction; a data folder a crash
  // left in the middle of one still has them, noted in roster_import_landings.
  it('should take back at the next start what a crash left landed, keeping students someone has worked with', async () => {
    const { other: everyRow } = districts;
    const app = everyRow;
    const [kept, gone] = await query<{ id: number; school_id: number; grade: number }>(
      app,
      `select id, school_id, grade from students where student_number in ('S830000', 'S830001') order by student_number`,
    );
    await query(
      app,
      `insert into pass_offs (student_id, school_id, grade, ladder_version_id, requirement_code, heard_on, tempo, passed)
       select ${kept!.id}, ${kept!.school_id}, ${kept!.grade}, min(id), 'bb-major', '2026-11-02', 72, true from ladder_versions`,
    );
    await query(
      app,
      `insert into roster_import_landings (run, student_id) values ('crashed', ${kept!.id}), ('crashed', ${gone!.id})`,
    );
    expect(await settleUnfinishedImports(app.database)).toBe(1);
    const left = await query<{ id: number }>(
      app,
      `select id from students where id in (${kept!.id}, ${gone!.id})`,
    );
    expect(left).toEqual([{ id: kept!.id }]);
    expect(await landingRows(app)).toBe(0);
    expect(await settleUnfinishedImports(app.database)).toBe(0);
  });
});
