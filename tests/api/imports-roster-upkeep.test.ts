import { describe, expect, it } from 'vitest';
import { housekeepingDone } from '../../server/db/client';
import { toRosterCsv } from '@shared/roster';
import { inventedRoster } from '../bench/roster-import';
import { studentCountDrift } from '../support/student-counts';
import { csvOf, useImportsApp } from './imports-app';

const { app, previewAndCommit, query, student } = useImportsApp();

describe('Roster imports keeping the roster in step', () => {
  it('should keep each student’s summary row in step through imports that add, move and withdraw', async () => {
    const summary = async (number: string) => {
      const [row] = await query<{ code: string; grade: number; active: boolean; stale: boolean }>(
        `select sc.code, a.grade, a.active, a.stale from student_attainment a join students s on s.id = a.student_id
         join schools sc on sc.id = a.school_id where s.student_number = '${number}'`,
      );
      return row;
    };
    await previewAndCommit(
      csvOf(
        'IM-4301,Orla,Penhallow,,6,HPMS,Concert Band,flute,Ada Penhallow,ada@merrowbasin.example',
      ),
    );
    // A new student has a summary row at once, marked for the next recount of rungs.
    expect(await summary('IM-4301')).toEqual({ code: 'HPMS', grade: 6, active: true, stale: true });
    await app.database.db.execute(
      `update student_attainment set stale = false where student_id = (select id from students where student_number = 'IM-4301')` as never,
    );
    await previewAndCommit(
      csvOf(
        'IM-4301,Orla,Penhallow,,7,QHMS,Concert Band,oboe,Ada Penhallow,ada@merrowbasin.example',
      ),
    );
    // The move and the new seat reach the summary: new school and grade, and a recount due.
    expect(await summary('IM-4301')).toEqual({ code: 'QHMS', grade: 7, active: true, stale: true });
    const quarryHill = await query<{
      student_number: string;
      first_name: string;
      last_name: string;
      grade: number;
    }>(
      `select s.student_number, s.first_name, s.last_name, s.grade from students s join schools sc on sc.id = s.school_id
       where sc.code = 'QHMS' and s.status = 'active' and s.student_number <> 'IM-4301' order by s.student_number`,
    );
    const lines = [
      'student_id,first_name,last_name,grade,school_code',
      'IM-4301,Orla,Penhallow,7,QHMS',
    ];
    for (const entry of quarryHill.slice(1))
      lines.push(
        `${entry.student_number},${entry.first_name},${entry.last_name},${entry.grade === 0 ? 'K' : entry.grade},QHMS`,
      );
    const { committed } = await previewAndCommit(Buffer.from(lines.join('\n')), {
      withdrawMissing: true,
    });
    expect(committed).toMatchObject({ withdrawn: 1, committed: true });
    const gone = quarryHill[0]!.student_number;
    expect(await summary(gone)).toMatchObject({ code: 'QHMS', active: false });
    // The per-school counts behind list totals follow the same adds, moves and withdrawals.
    expect(await studentCountDrift(app.database.db)).toEqual([]);
  });

  it('should gather the roster’s planner statistics again after a large import', async () => {
    const reltuples = async () =>
      (
        await query<{ reltuples: number }>(
          `select reltuples::int as reltuples from pg_class where oid = 'students'::regclass`,
        )
      )[0]!.reltuples;
    const before = await reltuples();
    const { committed } = await previewAndCommit(
      Buffer.from(toRosterCsv(inventedRoster(1_200, 5, 610_000))),
    );
    expect(committed).toMatchObject({ committed: true, created: 1_200 });
    const [{ count }] = await query<{ count: number }>(
      'select count(*)::int as count from students',
    );
    // Gathered once the import has answered.
    await housekeepingDone(app.database);
    // ANALYZE samples up to 30,000 rows (default_statistics_target 100), so it counts them all.
    expect(await reltuples()).toBe(count);
    expect(count).not.toBe(before);
    // A few changed students stay under PostgreSQL's autovacuum rule (50 + 10 % of the rows).
    await previewAndCommit(
      csvOf(
        'IM-7001,Tamsin,Oakridge,,7,HPMS,Concert Band,flute,Ada Oakridge,ada@merrowbasin.example',
      ),
    );
    await housekeepingDone(app.database);
    expect(await reltuples()).toBe(count);
  });

  it('should create the ensembles a school lacks, with a kind guessed from the name', async () => {
    const { previewed, committed } = await previewAndCommit(
      csvOf(
        'IM-5001,Clio,Ravensdale,,8,OMMS,Jazz Lab Band,alto-sax,,',
        'IM-5002,Pax,Ollerton,,8,OMMS,Chamber Strings,viola,,',
        'IM-5003,Juno,Fairweather,,7,OMMS,jazz lab band,trumpet,,',
      ),
    );
    expect(previewed.plan.newEnsembles).toEqual([
      { schoolCode: 'OMMS', name: 'Jazz Lab Band', kind: 'jazz-band' },
      { schoolCode: 'OMMS', name: 'Chamber Strings', kind: 'string-orchestra' },
    ]);
    expect(committed.committed).toBe(true);
    const made = await query<{ name: string; kind: string; seats: number }>(
      `select e.name, e.kind, (select count(*)::int from enrollments en where en.ensemble_id = e.id) as seats from ensembles e join schools s on s.id = e.school_id where s.code = 'OMMS' and e.name in ('Jazz Lab Band', 'Chamber Strings', 'jazz lab band') order by e.name`,
    );
    expect(made).toEqual([
      { name: 'Chamber Strings', kind: 'string-orchestra', seats: 1 },
      { name: 'Jazz Lab Band', kind: 'jazz-band', seats: 2 },
    ]);
  });

  it('should withdraw exactly the missing students of the file’s schools when asked', async () => {
    const cedarwash = await query<{
      student_number: string;
      first_name: string;
      last_name: string;
      grade: number;
    }>(
      `select s.student_number, s.first_name, s.last_name, s.grade from students s join schools sc on sc.id = s.school_id where sc.code = 'CWES' and s.status = 'active' order by s.student_number`,
    );
    const [left, erroneous, ...kept] = cedarwash;
    const lines = ['student_id,first_name,last_name,grade,school_code'];
    for (const entry of kept)
      lines.push(
        `${entry.student_number},${entry.first_name},${entry.last_name},${entry.grade === 0 ? 'K' : entry.grade},CWES`,
      );
    // A row with an error still lists its student, who must not be taken for a missing one.
    lines.push(
      `${erroneous!.student_number},${erroneous!.first_name},${erroneous!.last_name},14,CWES`,
    );
    const otherActive = await query<{ count: number }>(
      `select count(*)::int as count from students s join schools sc on sc.id = s.school_id where sc.code <> 'CWES' and s.status = 'active'`,
    );
    const { previewed, committed } = await previewAndCommit(Buffer.from(lines.join('\n')), {
      withdrawMissing: true,
      skipInvalid: true,
    });
    expect(
      previewed.plan.withdrawnStudents.map((entry: { studentId: string }) => entry.studentId),
    ).toEqual([left!.student_number]);
    expect(previewed.plan.schoolCodes).toEqual(['CWES']);
    expect(committed).toMatchObject({ withdrawn: 1, committed: true, unchanged: kept.length });
    expect((await student(left!.student_number))!.status).toBe('withdrawn');
    expect((await student(erroneous!.student_number))!.status).toBe('active');
    const otherAfter = await query<{ count: number }>(
      `select count(*)::int as count from students s join schools sc on sc.id = s.school_id where sc.code <> 'CWES' and s.status = 'active'`,
    );
    expect(otherAfter).toEqual(otherActive);
  });
});
