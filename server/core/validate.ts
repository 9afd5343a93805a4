import type { z } from 'zod';
import { badRequest, type FieldError } from './errors';

/** Turns zod issues into the field errors a form shows. */
export function fieldErrorsOf(error: z.ZodError): FieldError[] {
  return error.issues.map((issue) => ({
    field: issue.path.join('.') || '(request)',
    message: issue.message,
  }));
}

/** Parses input with a shared schema; bad input answers 400 with every field error. */
export function parseInput<Schema extends z.ZodType>(
  schema: Schema,
  input: unknown,
  what = 'The request',
): z.infer<Schema> {
  const result = schema.safeParse(input);
  if (!result.success) {
    const fieldErrors = fieldErrorsOf(result.error);
    const first = fieldErrors[0];
    throw badRequest(
      `${what} has ${fieldErrors.length === 1 ? 'a problem' : `${fieldErrors.length} problems`}${first ? `: ${first.field} — ${first.message}` : '.'}`,
      fieldErrors,
    );
  }
  return result.data;
}

/** Parses a numeric id from the route; anything else is a 404, as an unknown row would be. */
export function parseId(value: unknown): number {
  const id = typeof value === 'string' && /^\d{1,10}$/.test(value) ? Number(value) : NaN;
  if (!Number.isSafeInteger(id) || id <= 0 || id > 2_147_483_647) throw badRequest('The id in the address must be a positive whole number.');
  return id;
}
