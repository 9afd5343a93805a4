import {
  HttpErrorResponse,
  HttpHeaders,
  HttpResponse,
  type HttpEvent,
  type HttpInterceptorFn,
} from '@angular/common/http';
import { inject } from '@angular/core';
import { catchError, from, mergeMap, tap, throwError, type Observable } from 'rxjs';
import { LastVisit } from './last-visit';

/**
 * The reads kept for a visit with no network: who is signed in, the district, the director's
 * ensembles and their seats, the ladder in force, pass-offs and rungs, and a student's own
 * progress. Nothing else is kept on the device.
 */
const keptReads = [
  /^\/api\/me$/,
  /^\/api\/district$/,
  /^\/api\/ensembles(\/\d+)?$/,
  /^\/api\/ladder$/,
  /^\/api\/pass-offs$/,
  /^\/api\/analytics\/students(\/\d+\/progress)?$/,
];

/** The header on an answer that came from the device rather than the server. */
export const keptAtHeader = 'X-Tuttiboard-Kept-At';

/**
 * Whether an error means the server could not be reached: no network (status 0), or Angular's
 * service worker answering 504 for a request it could not pass on.
 */
export function unreachable(error: unknown): boolean {
  return (
    error instanceof HttpErrorResponse &&
    (error.status === 0 || (error.status === 504 && error.statusText === 'Gateway Timeout'))
  );
}

/**
 * Keeps the answers of the reads above on the device, and answers them from there when the
 * server cannot be reached, so the pass-off screen and a student's own page open offline.
 */
export const lastVisitInterceptor: HttpInterceptorFn = (request, next) => {
  if (request.method !== 'GET' || !keptReads.some((pattern) => pattern.test(request.url))) {
    return next(request);
  }
  const lastVisit = inject(LastVisit);
  const isMe = request.url === '/api/me';
  const key = request.urlWithParams;
  return next(request).pipe(
    tap((event) => {
      if (!(event instanceof HttpResponse) || !event.ok) return;
      lastVisit.answeredLive();
      if (isMe) void lastVisit.signedIn(event.body);
      else void lastVisit.keep(key, event.body);
    }),
    catchError((error: unknown): Observable<HttpEvent<unknown>> => {
      if (!unreachable(error)) return throwError(() => error);
      const recalled = isMe
        ? lastVisit
            .lastUser()
            .then((body) => (body === undefined ? undefined : { body, keptAt: 0 }))
        : lastVisit.recall(key);
      return from(recalled).pipe(
        mergeMap((kept) =>
          kept === undefined
            ? throwError(() => error)
            : [
                new HttpResponse({
                  body: kept.body,
                  status: 200,
                  url: request.urlWithParams,
                  headers: new HttpHeaders({ [keptAtHeader]: String(kept.keptAt) }),
                }),
              ],
        ),
      );
    }),
  );
};
