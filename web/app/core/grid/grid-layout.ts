import type { ColumnState } from 'ag-grid-community';
import type { GridState } from '@shared/api/grid-preference';

/** The layout worth remembering from the grid's column state: order, widths, hidden columns, sort. */
export function layoutOf(columnState: readonly ColumnState[]): GridState {
  const sorted = columnState.find((column) => column.sort);
  return {
    columns: columnState.map((column) => ({
      colId: column.colId,
      ...(column.width ? { width: Math.round(column.width) } : {}),
      hide: column.hide === true,
      pinned: column.pinned === 'left' || column.pinned === 'right' ? column.pinned : null,
    })),
    ...(sorted?.sort ? { sort: `${sorted.colId}:${sorted.sort}` } : {}),
  };
}

/**
 * The column state that restores a remembered layout. Columns the screen no longer has are
 * dropped; the sort applies only to a column that still exists and may be sorted.
 */
export function columnStateOf(
  layout: GridState,
  known: ReadonlySet<string>,
  sortable: ReadonlySet<string>,
): ColumnState[] {
  const [sortColumn, sortDirection] = (layout.sort ?? '').split(':');
  const sortKnown = sortColumn !== undefined && sortable.has(sortColumn);
  return layout.columns
    .filter((column) => known.has(column.colId))
    .map((column) => ({
      colId: column.colId,
      ...(column.width ? { width: column.width } : {}),
      hide: column.hide ?? false,
      pinned: column.pinned ?? null,
      sort:
        sortKnown && column.colId === sortColumn
          ? sortDirection === 'desc'
            ? 'desc'
            : 'asc'
          : null,
    }));
}
