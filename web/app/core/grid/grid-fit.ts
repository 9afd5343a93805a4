import type { ColDef, ColumnState } from 'ag-grid-community';

/** A phone's width (Material Design 3's compact window class, below 600 px). */
export const compactQuery = '(max-width: 599.98px)';
/** A tablet held upright, or a narrow window (Material Design 3's medium class, 600–840 px). */
export const mediumQuery = '(min-width: 600px) and (max-width: 839.98px)';
/** The width a column is counted at when its state has none. */
const defaultColumnWidth = 120;

/** Which of Material Design 3's window size classes the window is in. */
export type WindowClass = 'compact' | 'medium' | 'expanded';
/** How many columns a phone shows when the screen marks none as its key columns. */
const compactColumnCount = 3;

/**
 * The columns a phone keeps: those the screen marks with `context: { key: true }`, else the first
 * few shown. The others stay one tap away: a tap on a row lists them in a bottom sheet.
 */
export function keyColumnIds(columns: readonly ColDef[], shown: readonly string[]): string[] {
  const marked = columns
    .filter((column) => (column.context as { key?: boolean } | undefined)?.key)
    .map((column) => column.colId ?? column.field ?? '');
  return marked.length ? marked : shown.slice(0, compactColumnCount);
}

/**
 * The columns a medium window keeps: the key columns, then the others shown, in their order, as
 * long as they fit the grid's width at the widths they have (the rest go to the detail sheet).
 */
export function fittingColumnIds(
  columns: readonly ColDef[],
  state: readonly ColumnState[],
  available: number,
): string[] {
  const shown = state.filter((column) => !column.hide);
  const keys = new Set(
    keyColumnIds(
      columns,
      shown.map((column) => column.colId),
    ),
  );
  const widthOf = (column: ColumnState) => column.width ?? defaultColumnWidth;
  let used = shown
    .filter((column) => keys.has(column.colId))
    .reduce((sum, column) => sum + widthOf(column), 0);
  const keep = new Set(keys);
  for (const column of shown) {
    if (keep.has(column.colId)) continue;
    if (used + widthOf(column) > available) break;
    used += widthOf(column);
    keep.add(column.colId);
  }
  return shown.map((column) => column.colId).filter((colId) => keep.has(colId));
}
