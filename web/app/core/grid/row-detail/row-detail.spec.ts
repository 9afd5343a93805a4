import { describe, expect, it } from 'vitest';
import type { ColDef } from 'ag-grid-community';
import { columnIdOf, rowDetail } from './row-detail';

interface Pupil {
  id: number;
  lastName: string;
  firstName: string;
  grade: number;
  schoolCode: string;
  note: string | null;
}

const columns: ColDef<Pupil>[] = [
  { field: 'lastName', headerName: 'Last name' },
  { field: 'firstName', headerName: 'First name' },
  { field: 'grade', headerName: 'Grade', valueFormatter: ({ value }) => `Grade ${value}` },
  { colId: 'school', headerName: 'School', valueGetter: ({ data }) => data?.schoolCode },
  { field: 'note', headerName: 'Note', valueFormatter: ({ value }) => value ?? '' },
];

const pupil: Pupil = {
  id: 7,
  lastName: 'Okonkwo',
  firstName: 'Lior',
  grade: 8,
  schoolCode: 'HPMS',
  note: null,
};

describe('rowDetail', () => {
  it('should title the row with the shown columns and list the hidden ones with their headings', () => {
    const detail = rowDetail(columns, ['lastName', 'firstName'], pupil);
    expect(detail.title).toBe('Okonkwo · Lior');
    expect(detail.fields).toEqual([
      { label: 'Grade', value: 'Grade 8' },
      { label: 'School', value: 'HPMS' },
      { label: 'Note', value: '' },
    ]);
  });

  it('should read a hidden cell through its value getter and formatter, as the grid shows it', () => {
    const detail = rowDetail(columns, ['school'], pupil);
    expect(detail.title).toBe('HPMS');
    expect(detail.fields.map((field) => field.value)).toEqual(['Okonkwo', 'Lior', 'Grade 8', '']);
  });

  it('should list nothing when every column is shown', () => {
    const detail = rowDetail(
      columns,
      columns.map(columnIdOf as (column: ColDef<Pupil>) => string),
      pupil,
    );
    expect(detail.fields).toEqual([]);
    expect(detail.title).toBe('Okonkwo · Lior · Grade 8 · HPMS');
  });
});
