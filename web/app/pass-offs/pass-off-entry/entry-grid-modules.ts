import {
  CellStyleModule,
  ClientSideRowModelModule,
  RenderApiModule,
  RowApiModule,
  TooltipModule,
  ValidationModule,
  type Module,
} from 'ag-grid-community';

/** The AG Grid modules the entry grid uses: one ensemble's rows held in the browser. */
export const entryGridModules: Module[] = [
  ClientSideRowModelModule,
  CellStyleModule,
  RenderApiModule,
  RowApiModule,
  TooltipModule,
  ...(ngDevMode ? [ValidationModule] : []),
];
