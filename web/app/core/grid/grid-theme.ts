import { themeQuartz } from 'ag-grid-community';

/** The height of one grid row, in pixels. */
export const gridRowHeight = 38;
/** The height of the grid's header row, in pixels. */
export const gridHeaderHeight = 40;

/**
 * Tuttiboard's grid theme: the app's teal, brass and warm greys, Public Sans (already on the page,
 * so the theme loads no font), compact rows with calm borders.
 */
export const gridTheme = themeQuartz.withParams({
  fontFamily: 'Public Sans, system-ui, sans-serif',
  fontSize: 14,
  headerFontSize: 13,
  headerFontWeight: 600,
  foregroundColor: '#1d1b18',
  textColor: '#1d1b18',
  subtleTextColor: '#5c5650',
  backgroundColor: '#fffbf7',
  accentColor: '#0b6870',
  headerBackgroundColor: '#f6f1eb',
  headerTextColor: '#004f55',
  borderColor: '#e3dbd2',
  rowBorder: { color: '#eee7e0' },
  columnBorder: false,
  oddRowBackgroundColor: '#fffbf7',
  rowHoverColor: '#f1ebe4',
  selectedRowBackgroundColor: '#ddf2f3',
  wrapperBorderRadius: 12,
  borderRadius: 6,
  spacing: 6,
  rowHeight: gridRowHeight,
  headerHeight: gridHeaderHeight,
  cellHorizontalPadding: 12,
  focusShadow: { radius: 0, spread: 2, color: '#c2820f' },
});
