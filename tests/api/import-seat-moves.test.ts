import { describe, expect, it } from 'vitest';
import { rowsOf } from '../../server/db/client';
import { describeSeatMoves } from '@shared/roster';
import { useTestApp } from '../support/test-app';
import { importSteps } from './imports-app';

const header = 'student_id,first_name,last_name,grade,school_code,ensemble,instrument';

function csvOf(...lines: string[]): Buffer {
  return Buffer.from(`${[header, ...lines].join('\r\n')}\r\n`);
}

/** The student's current-year seats: ensemble name → active. */
async function seatsOf(number: string): Promise<Record<string, boolean>> {
  const rows = rowsOf<{ name: string; active: boolean }>(
    await app.database.db.execute(
      `select e.name, en.active from enrollments en
       join students s on s.id = en.student_id join ensembles e on e.id = en.ensemble_id
       join school_years y on y.id = en.school_year_id and y.current
       where s.student_number = '${number}'` as never,
    ),
  );
  return Object.fromEntries(rows.map((row) => [row.name, row.active]));
}

const app = useTestApp({ signIn: ['coordinator'] });
const { previewAndCommit } = importSteps(app, app.clients.coordinator);

describe('Roster import seat moves', () => {
  it('should end the seat a student leaves and say so when a file moves her to another ensemble', async () => {
    await previewAndCommit(
      csvOf(
        'MV-2045,Ilse,Varga,6,HPMS,Sixth Grade Band,flute',
        'MV-2045,Ilse,Varga,6,HPMS,String Orchestra,violin',
        'MV-2046,Pim,Oduya,6,HPMS,Sixth Grade Band,clarinet',
        'MV-2047,Roan,Teller,7,HPMS,Concert Band,trumpet',
      ),
    );
    expect(await seatsOf('MV-2045')).toEqual({
      'Sixth Grade Band': true,
      'String Orchestra': true,
    });

    // The next file lists bands only: she moves from Sixth Grade Band to Concert Band.
    const {
      previewed: { plan },
      committed: result,
    } = await previewAndCommit(
      csvOf(
        'MV-2045,Ilse,Varga,6,HPMS,Concert Band,flute',
        'MV-2046,Pim,Oduya,6,HPMS,Sixth Grade Band,clarinet',
        'MV-2047,Roan,Teller,7,HPMS,Concert Band,trumpet',
      ),
    );
    const moved = plan.updatedStudents.find(
      (student: { studentId: string }) => student.studentId === 'MV-2045',
    );
    expect(moved.changes).toEqual(
      expect.arrayContaining([
        { field: 'ensemble', before: null, after: 'Concert Band' },
        { field: 'ensemble', before: 'Sixth Grade Band', after: null },
      ]),
    );
    expect(describeSeatMoves(moved.changes)).toBe('Leaves Sixth Grade Band, joins Concert Band');
    expect(plan).toMatchObject({ updated: 1, unchanged: 2 });
    expect(result).toMatchObject({ rows: 3, created: 0, updated: 1, unchanged: 2 });

    // The orchestra seat is in an ensemble the file does not speak of: it stays.
    expect(await seatsOf('MV-2045')).toEqual({
      'Sixth Grade Band': false,
      'Concert Band': true,
      'String Orchestra': true,
    });
    expect(await seatsOf('MV-2046')).toEqual({ 'Sixth Grade Band': true });
  });

  it('should leave every seat alone when the students rows name no ensemble', async () => {
    const {
      previewed: { plan },
    } = await previewAndCommit(csvOf('MV-2047,Roan,Teller,7,HPMS,,'));
    expect(plan).toMatchObject({ updated: 0, unchanged: 1 });
    expect(await seatsOf('MV-2047')).toEqual({ 'Concert Band': true });
  });

  it('should keep the seat a skipped row names when the file is committed with skip-invalid', async () => {
    await previewAndCommit(
      csvOf(
        'MV-2048,Tove,Ranneby,6,HPMS,Sixth Grade Band,oboe',
        'MV-2048,Tove,Ranneby,6,HPMS,String Orchestra,viola',
      ),
    );
    // Her orchestra row disagrees on her grade, so it is left out; the orchestra is still
    // spoken of by another student's row.
    const { committed: result } = await previewAndCommit(
      csvOf(
        'MV-2048,Tove,Ranneby,6,HPMS,Sixth Grade Band,oboe',
        'MV-2048,Tove,Ranneby,7,HPMS,String Orchestra,viola',
        'MV-2049,Esko,Larsi,6,HPMS,String Orchestra,cello',
      ),
      { skipInvalid: true },
    );
    expect(result).toMatchObject({ committed: true, created: 1 });
    expect(result.errors).toHaveLength(1);
    expect(await seatsOf('MV-2048')).toEqual({
      'Sixth Grade Band': true,
      'String Orchestra': true,
    });
  });
});
