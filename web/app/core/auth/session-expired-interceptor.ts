import { HttpErrorResponse, type HttpInterceptorFn } from '@angular/common/http';
import { inject } from '@angular/core';
import { catchError, throwError } from 'rxjs';
import { CurrentUser } from './current-user';

/**
 * A 401 on any API call after sign-in means the session expired: go sign in again. Not while
 * the user is signing out: the requests still in flight then answer 401, and signing in again
 * would cancel the sign-out's own navigation and put the user straight back in.
 */
export const sessionExpiredInterceptor: HttpInterceptorFn = (request, next) => {
  const currentUser = inject(CurrentUser);
  return next(request).pipe(
    catchError((error: unknown) => {
      if (
        error instanceof HttpErrorResponse &&
        error.status === 401 &&
        currentUser.sessionExpired() &&
        request.url.startsWith('/api/')
      ) {
        currentUser.signIn();
      }
      return throwError(() => error);
    }),
  );
};
