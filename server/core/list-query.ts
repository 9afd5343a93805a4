import { asc, desc, ilike, or, type AnyColumn, type SQL } from 'drizzle-orm';
import type { PgSelect } from 'drizzle-orm/pg-core';
import type { z } from 'zod';
import { listQuerySchema, type ListQuery, type ListResponse } from '@shared/api/list';
import { badRequest } from './errors';
import { parseInput } from './validate';

/** What a list route can sort on: API field name → column or SQL expression. */
export type SortableFields = Record<string, AnyColumn | SQL>;

/** Parses `q`, `sort`, `offset`, `limit` plus the resource's own field filters. */
export function parseListQuery<Filters extends z.ZodObject>(
  query: unknown,
  filters: Filters,
): ListQuery & z.infer<Filters> {
  let schema = listSchemas.get(filters);
  if (!schema) listSchemas.set(filters, (schema = listQuerySchema.extend(filters.shape)));
  return parseInput(schema, query, 'The list query') as ListQuery & z.infer<Filters>;
}

/**
 * Each resource's list query schema, built once: zod compiles a schema's parser on its first
 * use, which had been happening on every request.
 */
const listSchemas = new WeakMap<z.ZodObject, z.ZodObject>();

/**
 * The ORDER BY for a list: the requested field, then the id so pages never repeat or skip a
 * row between two requests.
 */
export function orderFor(
  sort: string | undefined,
  sortable: SortableFields,
  fallback: string,
  id: AnyColumn,
): SQL[] {
  const [field, direction] = (sort ?? fallback).split(':') as [string, 'asc' | 'desc'];
  const column = sortable[field];
  if (!column) {
    throw badRequest(
      `Cannot sort by '${field}'. Sort by one of: ${Object.keys(sortable).join(', ')}.`,
      [{ field: 'sort', message: `Unknown field '${field}'.` }],
    );
  }
  const order = direction === 'desc' ? desc : asc;
  return [order(column), order(id)];
}

/** Escapes LIKE wildcards in a user's search text. */
export function likePattern(text: string, where: 'prefix' | 'anywhere' = 'anywhere'): string {
  const escaped = text.toLowerCase().replace(/[\\%_]/g, (character) => `\\${character}`);
  return where === 'prefix' ? `${escaped}%` : `%${escaped}%`;
}

/**
 * A list's search: a row matches when any of the columns contains the text, letter case aside
 * (PostgreSQL `ILIKE`, "Pattern Matching"); no condition when there is no text.
 */
export function matchesText(
  text: string | undefined,
  columns: (AnyColumn | SQL)[],
): SQL | undefined {
  if (!text) return undefined;
  const pattern = likePattern(text);
  return or(...columns.map((column) => ilike(column, pattern)));
}

/**
 * The `Link` header value (RFC 8288) pointing at the page after this one: the same request with
 * `after` set to the cursor and no `offset`.
 */
export function nextPageLink(originalUrl: string, cursor: string): string {
  const url = new URL(originalUrl, 'http://localhost');
  url.searchParams.delete('offset');
  url.searchParams.set('after', cursor);
  return `<${url.pathname}${url.search}>; rel="next"`;
}

/**
 * One page of a list and the count of all its rows, read side by side: `rows` is the filtered
 * select in Drizzle's dynamic mode (`.$dynamic()`, "Dynamic query building"), which this orders
 * and pages; `total` counts the same filter. Each row is turned into its API shape by `toItem`.
 */
export async function listPage<Query extends PgSelect, Item>(
  list: ListQuery,
  order: SQL[],
  rows: Query,
  total: PromiseLike<{ total: number }[]>,
  toItem: (row: Awaited<Query>[number]) => Item,
): Promise<ListResponse<Item>> {
  const [page, [counted]] = await Promise.all([
    rows
      .orderBy(...order)
      .limit(list.limit)
      .offset(list.offset),
    total,
  ]);
  return { rows: (page as Awaited<Query>).map(toItem), total: counted!.total };
}
