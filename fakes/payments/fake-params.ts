import { invalidParameter } from './payment-objects.js';

/** A request's form-encoded parameters, as the API's body parser reads them. */
export type Params = Record<string, unknown>;

export function text(params: Params, name: string): string | undefined {
  const value = params[name];
  return typeof value === 'string' ? value : undefined;
}

export function integer(params: Params, name: string, param = name): number | undefined {
  const value = params[name];
  if (value === undefined) return undefined;
  if (typeof value !== 'string' || !/^\d+$/.test(value))
    throw invalidParameter(param, `Invalid integer: ${String(value)}`);
  return Number(value);
}

export function metadata(params: Params, name: string): Record<string, string> {
  const value = params[name];
  if (value === undefined || value === '') return {};
  if (typeof value !== 'object' || value === null || Array.isArray(value))
    throw invalidParameter(name, 'Invalid object');
  const entries = Object.entries(value as Record<string, unknown>);
  if (entries.length > 50) throw invalidParameter(name, 'Metadata can have up to 50 keys.');
  for (const [key, entry] of entries) {
    if (typeof entry !== 'string' || key.length > 40 || entry.length > 500)
      throw invalidParameter(
        `${name}[${key}]`,
        'Metadata keys are at most 40 characters and values at most 500.',
      );
  }
  return value as Record<string, string>;
}

/** A list page, newest first, with the service's cursor parameters. */
export function listPage<Item extends { id: string }>(all: Item[], params: Params, path: string) {
  const limit = Math.min(Math.max(integer(params, 'limit') ?? 10, 1), 100);
  const newestFirst = [...all].reverse();
  const after = text(params, 'starting_after');
  let start = 0;
  if (after) {
    const index = newestFirst.findIndex((item) => item.id === after);
    if (index < 0) throw invalidParameter('starting_after', `No such object: '${after}'`);
    start = index + 1;
  }
  const data = newestFirst.slice(start, start + limit);
  return { object: 'list', url: path, has_more: start + limit < newestFirst.length, data };
}
