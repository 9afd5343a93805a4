import * as z from 'zod';

/**
 * The rules every input field follows, so that a value the database cannot hold is refused as a
 * bad request before it reaches a statement.
 */

/** The largest value of a PostgreSQL `integer` (PostgreSQL 18 documentation, §8.1.1). */
export const int4Max = 2_147_483_647;

/** A record's id in a body: a positive whole number that fits the `integer` column it names. */
export const recordId = (message = 'An id is a positive whole number.') =>
  z
    .number({ message })
    .int(message)
    .positive(message)
    .max(int4Max, 'That id is too large to be one of ours.');

/** A record's id in a query string (`?studentId=12`). */
export const idParameter = z.coerce
  .number({ message: 'An id is a positive whole number.' })
  .int('An id is a positive whole number.')
  .positive('An id is a positive whole number.')
  .max(int4Max, 'That id is too large to be one of ours.');

/** The version a change starts from (optimistic concurrency). */
export const versionNumber = z.number().int().min(0).max(int4Max);

/** A create schema's field as a change sends it: the same rule without the create's default. */
type WithoutDefault<Field> = Field extends z.ZodDefault<infer Inner> ? Inner : Field;

/**
 * The PATCH body of a record, built from the fields its create body checks: each field keeps its
 * rule but drops its `.default()` (zod's `removeDefault()`, so an absent field stays absent rather
 * than being reset), every field is optional (`.partial()`), unknown keys are refused
 * (`z.strictObject`), and the version the editor started from is required.
 */
export function patchSchemaOf<Shape extends z.ZodRawShape>(shape: Shape) {
  const fields = Object.fromEntries(
    Object.entries(shape).map(([key, field]) => [
      key,
      field instanceof z.ZodDefault ? field.removeDefault() : field,
    ]),
  ) as { [Key in keyof Shape]: WithoutDefault<Shape[Key]> };
  return z.strictObject(fields).partial().extend({ version: versionNumber });
}

/** The first and last years a date we keep may fall in. */
export const earliestYear = 1900;
export const latestYear = 2199;

/** A calendar date, YYYY-MM-DD (ISO 8601), in a year between 1900 and 2199. */
export const calendarDate = (
  message: string | { message: string } = 'Write the date as YYYY-MM-DD.',
) =>
  z.iso.date(message).refine((value) => {
    const year = Number(value.slice(0, 4));
    return year >= earliestYear && year <= latestYear;
  }, `Use a date between ${earliestYear} and ${latestYear}.`);

/**
 * C0 control characters and DEL except tab, line feed and carriage return (Unicode's Cc
 * category, The Unicode Standard §23.1): PostgreSQL text cannot hold NUL at all, and the rest
 * are invisible in every screen and export.
 */
// The rule's whole point is to match control characters.
// eslint-disable-next-line no-control-regex
export const controlCharacters = /[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F]/;

/** Text a person typed or a file held: trimmed, with no control characters but tab and line breaks. */
export const plainText = () =>
  z
    .string()
    .trim()
    .refine(
      (value) => !controlCharacters.test(value),
      'Remove the control characters from this text.',
    );
