import { HttpErrorResponse } from '@angular/common/http';
import type { ErrorBody, FieldError } from '@shared/api/error-body';
import { map, type OperatorFunction } from 'rxjs';
import type { z } from 'zod';

/** Parses an HTTP response with the shared zod schema, so the client trusts only checked data. */
export function parsedWith<Schema extends z.ZodType>(
  schema: Schema,
): OperatorFunction<unknown, z.infer<Schema>> {
  return map((body) => schema.parse(body));
}

/** The API's error body of a failed call (the shared `ErrorBody`), or null for anything else. */
export function apiErrorOf(error: unknown): ErrorBody['error'] | null {
  if (!(error instanceof HttpErrorResponse)) return null;
  const body: unknown = error.error;
  if (typeof body !== 'object' || body === null || !('error' in body)) return null;
  const answer = (body as Partial<ErrorBody>).error;
  if (typeof answer !== 'object' || answer === null || typeof answer.message !== 'string')
    return null;
  return { ...answer, fieldErrors: Array.isArray(answer.fieldErrors) ? answer.fieldErrors : [] };
}

/** The message of an API error answer, or a plain fallback. */
export function errorMessage(
  error: unknown,
  fallback = 'Something went wrong. Try again.',
): string {
  return apiErrorOf(error)?.message ?? fallback;
}

/** The fields a 400 answer names, each with what is wrong with it; empty for anything else. */
export function fieldErrorsOf(error: unknown): FieldError[] {
  return apiErrorOf(error)?.fieldErrors ?? [];
}
