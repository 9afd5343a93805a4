import { describe, expect, it } from 'vitest';
import type { ColDef, ColumnState } from 'ag-grid-community';
import { fittingColumnIds, keyColumnIds } from './grid-fit';

const columns: ColDef[] = [
  { field: 'assetTag', context: { key: true } },
  { field: 'instrument', context: { key: true } },
  { field: 'maker' },
  { field: 'status', context: { key: true } },
  { field: 'school' },
  { field: 'condition' },
];

const state = (widths: Record<string, number | undefined>, hidden: string[] = []): ColumnState[] =>
  Object.entries(widths).map(([colId, width]) => ({
    colId,
    ...(width === undefined ? {} : { width }),
    hide: hidden.includes(colId),
  }));

describe('keyColumnIds', () => {
  it('should keep the columns marked as key columns', () => {
    expect(keyColumnIds(columns, ['assetTag', 'instrument', 'maker', 'status'])).toEqual([
      'assetTag',
      'instrument',
      'status',
    ]);
  });

  it('should keep the first three shown when none is marked', () => {
    const plain = columns.map(({ field }) => ({ field }));
    expect(keyColumnIds(plain, ['maker', 'status', 'school', 'condition'])).toEqual([
      'maker',
      'status',
      'school',
    ]);
  });
});

describe('fittingColumnIds', () => {
  const widths = {
    assetTag: 120,
    instrument: 160,
    maker: 180,
    status: 110,
    school: 150,
    condition: 100,
  };

  it('should keep the key columns and then the others, in order, while they fit the width', () => {
    // Key columns: 120 + 160 + 110 = 390; maker (180) makes 570, school (150) would make 720.
    expect(fittingColumnIds(columns, state(widths), 700)).toEqual([
      'assetTag',
      'instrument',
      'maker',
      'status',
    ]);
  });

  it('should stop at the first column that does not fit, so the order of the row is kept', () => {
    // maker (180) does not fit in 500 - 390; condition (100) would, but comes after it.
    expect(fittingColumnIds(columns, state(widths), 500)).toEqual([
      'assetTag',
      'instrument',
      'status',
    ]);
  });

  it('should leave out columns the user hid, and keep every shown column when all fit', () => {
    expect(fittingColumnIds(columns, state(widths, ['maker']), 2000)).toEqual([
      'assetTag',
      'instrument',
      'status',
      'school',
      'condition',
    ]);
  });

  it('should count a column without a width at the default width', () => {
    const noWidth = { ...widths, maker: undefined };
    // 390 + 120 (the default) = 510 fits in 520; school (150) does not.
    expect(fittingColumnIds(columns, state(noWidth), 520)).toEqual([
      'assetTag',
      'instrument',
      'maker',
      'status',
    ]);
  });
});
