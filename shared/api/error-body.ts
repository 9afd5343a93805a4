/** A field and what is wrong with it, as a form shows it. */
export interface FieldError {
  field: string;
  message: string;
}

/**
 * The JSON every failed API call answers with, whatever its status. Kept free of zod: the web
 * reads it in every chunk (web/app/core/parse.ts).
 */
export interface ErrorBody {
  error: { status: number; code: string; message: string; fieldErrors: FieldError[] };
}
