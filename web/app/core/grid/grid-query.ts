import type { SortModelItem } from 'ag-grid-community';

/** Extra query parameters a screen adds to the list request: field filters such as `schoolId`. */
export type GridFilters = Record<string, string | number | boolean | null | undefined>;

/** The `sort=field:asc|desc` parameter for the grid's sort model; the API sorts by one field. */
export function sortParameter(sortModel: readonly SortModelItem[]): string | undefined {
  const first = sortModel[0];
  return first ? `${first.colId}:${first.sort}` : undefined;
}

/**
 * The query of one list request: the search text as `q`, the sort, the page, and the screen's
 * filters; empty filters are left out so the API applies none.
 */
export function listParameters(request: {
  quickSearch?: string;
  sort?: string;
  filters?: GridFilters;
  offset: number;
  limit: number;
}): Record<string, string> {
  const parameters: Record<string, string> = {};
  const q = request.quickSearch?.trim();
  if (q) parameters['q'] = q;
  if (request.sort) parameters['sort'] = request.sort;
  for (const [name, value] of Object.entries(request.filters ?? {})) {
    if (value === null || value === undefined || value === '') continue;
    parameters[name] = String(value);
  }
  parameters['offset'] = String(request.offset);
  parameters['limit'] = String(request.limit);
  return parameters;
}

/**
 * The `after` cursor of the next page, from a list answer's `Link: <…>; rel="next"` header
 * (RFC 8288); none when the header is absent or names no next page.
 */
export function nextCursor(link: string | null): string | undefined {
  if (!link) return undefined;
  for (const part of link.split(',')) {
    const match = /^\s*<([^>]*)>\s*;\s*rel="?next"?\s*$/i.exec(part);
    if (match) return new URL(match[1]!, 'http://localhost').searchParams.get('after') ?? undefined;
  }
  return undefined;
}
