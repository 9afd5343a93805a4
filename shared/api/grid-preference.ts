import * as z from 'zod';
import { plainText } from './input-rules';

/** The largest grid layout kept for one user and grid, in bytes of JSON. */
export const gridStateMaxBytes = 20 * 1024;

/** A grid's name in `/api/grid-preferences/:grid`, such as 'students' or 'ensemble-members'. */
export const gridNamePattern = /^[a-z][a-z0-9-]{0,59}$/;

/** One column of a remembered layout, in display order. */
export const gridColumnStateSchema = z.object({
  colId: plainText().min(1).max(100),
  width: z.number().int().min(20).max(2000).optional(),
  hide: z.boolean().optional(),
  pinned: z.enum(['left', 'right']).nullable().optional(),
});

/** A remembered grid layout: the columns shown, their order and widths, and the sort. */
export const gridStateSchema = z
  .object({
    columns: z.array(gridColumnStateSchema).max(200),
    sort: plainText().max(120).optional(),
  })
  .refine((state) => new TextEncoder().encode(JSON.stringify(state)).length <= gridStateMaxBytes, {
    message: `A grid layout is at most ${gridStateMaxBytes} bytes of JSON.`,
  });
export type GridState = z.infer<typeof gridStateSchema>;

/** `PUT /api/grid-preferences/:grid` sends `{ state }`. */
export const gridPreferenceInputSchema = z.strictObject({ state: gridStateSchema });

/** `GET`/`PUT /api/grid-preferences/:grid` answer this; `state` is null when nothing is kept. */
export const gridPreferenceSchema = z.object({
  grid: z.string(),
  state: gridStateSchema.nullable(),
  /** ISO 8601 time the layout was saved, or null. */
  updatedAt: z.string().nullable(),
});
export type GridPreference = z.infer<typeof gridPreferenceSchema>;
