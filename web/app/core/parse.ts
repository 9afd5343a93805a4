import { map, type OperatorFunction } from 'rxjs';
import type { z } from 'zod';

/** Parses an HTTP response with the shared zod schema, so the client trusts only checked data. */
export function parsedWith<Schema extends z.ZodType>(schema: Schema): OperatorFunction<unknown, z.infer<Schema>> {
  return map((body) => schema.parse(body));
}

/** The message of an API error answer, or a plain fallback. */
export function errorMessage(error: unknown, fallback = 'Something went wrong. Try again.'): string {
  const body = (error as { error?: { error?: { message?: string } } })?.error;
  return body?.error?.message ?? fallback;
}
