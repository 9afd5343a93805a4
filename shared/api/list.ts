import * as z from 'zod';
import { plainText } from './input-rules';

/** The query every list route takes: search, sort, paging; field filters are added per resource. */
export const listQuerySchema = z.strictObject({
  q: plainText().max(200).optional(),
  sort: z
    .string()
    .regex(/^[A-Za-z][A-Za-z0-9]*:(asc|desc)$/, 'Sort must look like field:asc or field:desc.')
    .optional(),
  offset: z.coerce.number().int().min(0).max(10_000_000).default(0),
  limit: z.coerce.number().int().min(1).max(1000).default(100),
});
export type ListQuery = z.infer<typeof listQuerySchema>;

/** The answer of every list route. */
export function listResponseSchema<Row extends z.ZodType>(row: Row) {
  return z.object({ rows: z.array(row), total: z.number().int().min(0) });
}
export interface ListResponse<Row> {
  rows: Row[];
  total: number;
}
