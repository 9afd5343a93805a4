import { describe, expect, it } from 'vitest';
import { rosterGeneration } from '../../server/imports/roster-snapshot';
import { demoSchools } from '../../server/seed/demo-people';
import type { RosterRow } from '@shared/roster';
import { inventedRoster } from '../bench/roster-import';
import type { TestApp } from '../support/test-app';
import { importInSteps, query, rosterState, useTwoDistricts } from './import-differences-app';

// The same imports run in two districts, one committing with the short cut (only the rows the
// plan found different) and one comparing every row again.
const districts = useTwoDistricts();

const generationOf = (app: TestApp) => rosterGeneration((text) => query(app, text));

const first = inventedRoster(240, 5, 810_000);
const firstStudents = [...new Set(first.map((row) => row.studentId))];
const withdrawnBefore = firstStudents.filter((_, index) => index % 50 === 7);

/** The next file: a few of every kind of change, most rows as they were, and new students. */
function nextFile(): RosterRow[] {
  const otherSchool = (code: string) => demoSchools.find((school) => school.code !== code)!.code;
  // Student fields change on every row of the student (a file's rows must agree on them);
  // seats change row by row.
  const rows = first.map((row, index): RosterRow => {
    const student = firstStudents.indexOf(row.studentId);
    if (student % 40 === 1) return { ...row, firstName: `${row.firstName}a` };
    if (student % 40 === 2) return { ...row, grade: row.grade === 12 ? 11 : row.grade + 1 };
    if (student % 40 === 3) return { ...row, schoolCode: otherSchool(row.schoolCode) };
    if (student % 40 === 6)
      return { ...row, guardianEmail: `changed.${student}@families.merrowbasin.example` };
    if (index % 40 === 4)
      return { ...row, instrument: row.instrument === 'violin' ? 'cello' : 'violin' };
    if (index % 40 === 5) return { ...row, ensemble: 'Differences Winds' };
    return row;
  });
  // A second seat for one student whose first row is unchanged.
  rows.push({ ...first[10]!, ensemble: 'Differences Strings', instrument: 'cello' });
  return [...rows, ...inventedRoster(20, 6, 820_000)];
}

describe('A roster import whose plan still holds', () => {
  it('should write only the rows the plan found different, and leave what comparing every row leaves', async () => {
    const { one: shortCut, other: everyRow } = districts;
    for (const app of [shortCut, everyRow]) {
      const base = await importInSteps(app, first);
      expect(base.result.created).toBe(first.length);
      await query(
        app,
        `update students set status = 'withdrawn'
         where student_number in (${withdrawnBefore.map((number) => `'${number}'`).join(', ')})`,
      );
    }
    const file = nextFile();
    const fast = await importInSteps(shortCut, file);
    expect(fast.plan.errors).toEqual([]);
    // Any write between the plan and the commit (here only the sequence itself) makes the
    // commit compare every row again.
    const slow = await importInSteps(everyRow, file, () =>
      query(everyRow, `select nextval('roster_generation')`),
    );

    const { created, updated, unchanged } = fast.plan.counts;
    expect(fast.result).toMatchObject({ committed: true, created, updated, unchanged });
    expect(updated).toBeGreaterThan(withdrawnBefore.length);
    expect(slow.result).toEqual({ ...fast.result, importId: slow.result.importId });
    expect(await rosterState(shortCut)).toEqual(await rosterState(everyRow));

    if (shortCut.database.kind === 'pglite') {
      // The short cut staged only the existing students whose own fields or status differ.
      const changedStudents = new Set(
        fast.plan.updatedStudents
          .filter((student) =>
            student.changes.some(
              (change) => change.field !== 'ensemble' && change.field !== 'instrument',
            ),
          )
          .map((student) => student.studentId),
      );
      expect(changedStudents.size).toBeGreaterThan(withdrawnBefore.length);
      expect(fast.staged).toBe(changedStudents.size);
      expect(slow.staged).toBe(firstStudents.length);
    } else {
      // On a PostgreSQL server every row is compared again.
      expect(fast.staged).toBeNull();
    }
  });

  it('should compare every row again when the roster changed after the plan read it', async () => {
    const { one: shortCut } = districts;
    const file = nextFile();
    const [student] = firstStudents;
    const inFile = file.find((row) => row.studentId === student)!;
    const again = await importInSteps(shortCut, file, () =>
      // A director's edit lands between the plan's reads and the commit.
      query(
        shortCut,
        `update students set first_name = 'Edited' where student_number = '${student}'`,
      ),
    );
    // The plan saw nothing to do; the commit put the file's name back all the same.
    expect(again.plan.counts.updated).toBe(0);
    expect(again.result).toMatchObject({ committed: true, created: 0, updated: 1 });
    const [row] = await query<{ first_name: string }>(
      shortCut,
      `select first_name from students where student_number = '${student}'`,
    );
    expect(row!.first_name).toBe(inFile.firstName);
  });

  it('should move the roster generation with every write to what an import compares, and only then', async () => {
    const { one: shortCut } = districts;
    const app = shortCut;
    const writes = [
      `update students set guardian_name = guardian_name where student_number = '${firstStudents[1]}'`,
      `update enrollments set active = active where id = (select min(id) from enrollments)`,
      `update ensembles set name = name where id = (select min(id) from ensembles)`,
      `update schools set name = name where id = (select min(id) from schools)`,
      `update school_years set name = name where id = (select min(id) from school_years)`,
    ];
    for (const write of writes) {
      const before = await generationOf(app);
      await query(app, write);
      expect(await generationOf(app), write).not.toBe(before);
    }
    const before = await generationOf(app);
    await query(
      app,
      `insert into audit_log (user_id, action, entity, entity_id) values (null, 'note', 'test', '1')`,
    );
    await query(app, `select count(*) from students`);
    expect(await generationOf(app)).toBe(before);
  });
});
