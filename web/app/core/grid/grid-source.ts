import type { ColDef } from 'ag-grid-community';

/**
 * What a `tb-server-grid` lists: the API's list route, the name its remembered layout and
 * exported file go by, what one row is, its columns with the API's sort names, and the words of
 * its region and empty state. One of these per list screen, built by `gridSource()`.
 */
export interface GridSource<Row> {
  /** The list route, such as '/api/students'. */
  readonly endpoint: string;
  /** Names the remembered layout (`/api/grid-preferences/<gridId>`) and the exported file. */
  readonly gridId: string;
  /** The label of the grid's region for assistive technology: 'Students'. */
  readonly label: string;
  /** What one row is, for the count: 'student'. */
  readonly itemName: string;
  /** The columns; each `colId` (or `field`) is the name the API sorts by. */
  readonly columns: ColDef<Row>[];
  /** The API's sort names; only these columns get a sortable header. */
  readonly sortFields: readonly string[];
  /** The empty state's title: "No students match" unless the screen words it otherwise. */
  readonly emptyTitle: string;
  /** The empty state's line under its title: what to do about it. */
  readonly emptyMessage: string;
}

/** The words and names of a grid source that are not read from its route. */
export type GridSourceOptions = Partial<
  Pick<GridSource<unknown>, 'endpoint' | 'gridId' | 'label' | 'emptyTitle' | 'emptyMessage'>
>;

/**
 * The grid source of the API's `/api/<resource>` list: its layout is named for the resource and
 * its label is the resource capitalised, unless `options` name them otherwise.
 */
export function gridSource<Row>(
  resource: string,
  itemName: string,
  sortFields: readonly string[],
  columns: ColDef<Row>[],
  options: GridSourceOptions = {},
): GridSource<Row> {
  const label = options.label ?? resource.charAt(0).toUpperCase() + resource.slice(1);
  return {
    endpoint: options.endpoint ?? `/api/${resource}`,
    gridId: options.gridId ?? resource,
    label,
    itemName,
    columns,
    sortFields,
    emptyTitle: options.emptyTitle ?? `No ${label.toLowerCase()} match`,
    emptyMessage: options.emptyMessage ?? '',
  };
}
