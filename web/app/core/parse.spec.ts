// Angular's packages are partially compiled: the JIT compiler links them outside a build.
import '@angular/compiler';
import { HttpErrorResponse, HttpHeaders } from '@angular/common/http';
import type { ErrorBody } from '@shared/api/error-body';
import { describe, expect, it } from 'vitest';
import { apiErrorOf, errorMessage, fieldErrorsOf } from './parse';

function answer(status: number, body: unknown): HttpErrorResponse {
  return new HttpErrorResponse({
    status,
    error: body,
    headers: new HttpHeaders(),
    url: '/api/schools',
  });
}

describe('apiErrorOf', () => {
  it('should read the shared error body of a failed API call', () => {
    const body: ErrorBody = {
      error: {
        status: 400,
        code: 'bad_request',
        message: 'The school needs a name.',
        fieldErrors: [{ field: 'name', message: 'Required' }],
      },
    };
    expect(apiErrorOf(answer(400, body))).toEqual(body.error);
    expect(errorMessage(answer(400, body))).toBe('The school needs a name.');
    expect(fieldErrorsOf(answer(400, body))).toEqual([{ field: 'name', message: 'Required' }]);
  });

  it('should answer null and the fallback when the answer is not the error body', () => {
    const proxyPage = answer(502, '<html>Bad gateway</html>');
    expect(apiErrorOf(proxyPage)).toBeNull();
    expect(errorMessage(proxyPage, 'Try again.')).toBe('Try again.');
    expect(fieldErrorsOf(new Error('offline'))).toEqual([]);
  });
});
