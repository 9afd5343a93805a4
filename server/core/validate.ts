import { z } from 'zod';
import { badRequest, type FieldError } from './errors';

/** Turns zod issues into the field errors a form shows. */
export function fieldErrorsOf(error: z.ZodError): FieldError[] {
  return error.issues.flatMap((issue) =>
    issue.code === 'unrecognized_keys'
      ? issue.keys.map((key) => ({
          field: [...issue.path, key].join('.'),
          message: `'${key}' is not a field this request takes.`,
        }))
      : [{ field: issue.path.join('.') || '(request)', message: issue.message }],
  );
}

/**
 * Each object schema as parseInput applies it: a field or query parameter the schema does not
 * name is refused (and named in the answer) rather than quietly dropped, so a misspelt filter
 * cannot answer every row. Schemas that opted into other keys (`z.looseObject`) keep them.
 */
const strictSchemas = new WeakMap<z.ZodType, z.ZodType>();
function strictVersion(schema: z.ZodType): z.ZodType {
  if (!(schema instanceof z.ZodObject) || schema._zod.def.catchall !== undefined) return schema;
  let strict = strictSchemas.get(schema);
  if (!strict) strictSchemas.set(schema, (strict = schema.strict()));
  return strict;
}

/** What a route that takes no query parameters (or no body fields) accepts. */
export const nothing = z.strictObject({});

/** Parses input with a shared schema; bad input answers 400 with every field error. */
export function parseInput<Schema extends z.ZodType>(
  schema: Schema,
  input: unknown,
  what = 'The request',
): z.infer<Schema> {
  const result = strictVersion(schema).safeParse(input);
  if (!result.success) {
    const fieldErrors = fieldErrorsOf(result.error);
    const first = fieldErrors[0];
    throw badRequest(
      `${what} has ${fieldErrors.length === 1 ? 'a problem' : `${fieldErrors.length} problems`}${first ? `: ${first.field} — ${first.message}` : '.'}`,
      fieldErrors,
    );
  }
  return result.data as z.infer<Schema>;
}

/** Parses a numeric id from the route; anything else is a 404, as an unknown row would be. */
export function parseId(value: unknown): number {
  const id = typeof value === 'string' && /^\d{1,10}$/.test(value) ? Number(value) : NaN;
  if (!Number.isSafeInteger(id) || id <= 0 || id > 2_147_483_647)
    throw badRequest('The id in the address must be a positive whole number.');
  return id;
}
