import { HttpErrorResponse } from '@angular/common/http';
import type { AbstractControl, FormGroup, ValidationErrors, ValidatorFn } from '@angular/forms';
import type { WritableSignal } from '@angular/core';
import type { z } from 'zod';
import { errorMessage, fieldErrorsOf } from '../parse';

/**
 * A form control validator from one field of a shared zod schema, so a form shows the same
 * message the API would answer with: `{ schema: '<message>' }` when the value does not parse.
 */
export function schemaValidator(schema: z.ZodType): ValidatorFn {
  return (control: AbstractControl): ValidationErrors | null => {
    const result = schema.safeParse(control.value);
    return result.success
      ? null
      : { schema: result.error.issues[0]?.message ?? 'Check this field.' };
  };
}

/** The message to show under a control, once the user has touched it. */
export function fieldMessage(control: AbstractControl | null): string {
  if (!control || !control.errors || !(control.touched || control.dirty)) return '';
  const errors = control.errors;
  return String(
    errors['server'] ??
      errors['schema'] ??
      (errors['required'] ? 'This is needed.' : 'Check this field.'),
  );
}

/** Whether the API refused the change because someone else saved the row first (409). */
export function isConflict(error: unknown): boolean {
  return error instanceof HttpErrorResponse && error.status === 409;
}

/**
 * Puts the API's field errors (a 400 answer) on the form's controls; answers whether any
 * field error matched a control.
 */
export function showFieldErrors(form: FormGroup, error: unknown): boolean {
  let shown = false;
  for (const fieldError of fieldErrorsOf(error)) {
    const control = form.get(fieldError.field);
    if (!control) continue;
    control.setErrors({ ...(control.errors ?? {}), server: fieldError.message });
    control.markAsTouched();
    shown = true;
  }
  return shown;
}

/**
 * Shows why the API refused to save a record form: a 409 turns `conflict` on (when given), a
 * 400's field errors go under their fields. Answers the message for anything else, or '' when
 * the failure is already shown.
 */
export function saveFailureMessage(
  form: FormGroup,
  error: unknown,
  conflict?: WritableSignal<boolean>,
): string {
  if (conflict && isConflict(error)) {
    conflict.set(true);
    return '';
  }
  return showFieldErrors(form, error) ? '' : errorMessage(error);
}
