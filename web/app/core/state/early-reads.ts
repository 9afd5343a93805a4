import {
  HttpClient,
  HttpContext,
  HttpContextToken,
  HttpParams,
  HttpRequest,
  type HttpEvent,
  type HttpInterceptorFn,
} from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { shareReplay, type Observable } from 'rxjs';

/** How long an early read waits for its screen before it is dropped rather than answered stale. */
const keptFor = 20_000;

/** Marks the early read itself, so the interceptor lets it through to the server. */
const earlyRead = new HttpContextToken<boolean>(() => false);

/** A read a screen will make, as its data class asks for it (same URL, same parameter order). */
export interface ScreenRead {
  url: string;
  params?: Record<string, string | number>;
}

/**
 * Reads a screen needs, started while its code is still loading (from the route's `canMatch`),
 * so their round trips overlap the code's instead of following it. The screen's own request for
 * the same URL is answered by the read already under way, once; nothing else is cached.
 */
@Injectable({ providedIn: 'root' })
export class EarlyReads {
  private readonly http = inject(HttpClient);
  private readonly started = new Map<string, Observable<HttpEvent<unknown>>>();

  start(reads: readonly ScreenRead[]): void {
    for (const read of reads) {
      const request = new HttpRequest('GET', read.url, {
        params: new HttpParams({ fromObject: read.params ?? {} }),
        context: new HttpContext().set(earlyRead, true),
      });
      const key = request.urlWithParams;
      if (this.started.has(key)) continue;
      const answer = this.http.request(request).pipe(shareReplay());
      this.started.set(key, answer);
      // Subscribed here so the request leaves now; the screen takes the answer when it asks.
      answer.subscribe({ error: () => undefined });
      setTimeout(() => {
        if (this.started.get(key) === answer) this.started.delete(key);
      }, keptFor);
    }
  }

  /** The early read of this request, if one was started and not yet taken. */
  take(request: HttpRequest<unknown>): Observable<HttpEvent<unknown>> | undefined {
    if (request.method !== 'GET' || request.context.get(earlyRead)) return undefined;
    const answer = this.started.get(request.urlWithParams);
    this.started.delete(request.urlWithParams);
    return answer;
  }
}

/** Answers a screen's read from the early read of the same URL, when one is under way. */
export const earlyReadsInterceptor: HttpInterceptorFn = (request, next) =>
  inject(EarlyReads).take(request) ?? next(request);
