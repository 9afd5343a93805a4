import {
  CellStyleModule,
  ColumnApiModule,
  InfiniteRowModelModule,
  RowStyleModule,
  ValidationModule,
  type Module,
} from 'ag-grid-community';

/**
 * The AG Grid modules a server-paged grid uses, and nothing more (the grid stays on lazy routes).
 * Development builds add the validation module, which names a missing module or a wrong option
 * instead of printing a bare error number.
 */
export const serverGridModules: Module[] = [
  InfiniteRowModelModule,
  ColumnApiModule,
  CellStyleModule,
  RowStyleModule,
  ...(ngDevMode ? [ValidationModule] : []),
];
