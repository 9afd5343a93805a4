import {
  HttpClient,
  HttpContext,
  HttpContextToken,
  HttpParams,
  HttpRequest,
  HttpResponse,
  type HttpEvent,
  type HttpInterceptorFn,
} from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { shareReplay, type Observable } from 'rxjs';
import { pagesAfter, type ScreenRead } from '@shared/api/entry-reads';
import { LastVisit } from '../offline/last-visit';

/** How long an early read waits for its screen before it is dropped rather than answered stale. */
export const keptFor = 20_000;

/** The GET request of a read, as a screen's data class makes it (same URL, same parameter order). */
export function readRequest(read: ScreenRead, context?: HttpContext): HttpRequest<unknown> {
  return new HttpRequest('GET', read.url, {
    params: new HttpParams({ fromObject: read.params ?? {} }),
    ...(context && { context }),
  });
}

/** The key a screen read's answer is known by: its URL with its parameters, in their order. */
export function readKey(read: ScreenRead): string {
  return readRequest(read).urlWithParams;
}

/** Marks the early read itself, so the interceptor lets it through to the server. */
const earlyRead = new HttpContextToken<boolean>(() => false);

/**
 * Reads a screen needs, started while its code is still loading (from the route's `canMatch`),
 * so their round trips overlap the code's instead of following it. The screen's own request for
 * the same URL is answered by the read already under way, once; nothing else is cached.
 */
@Injectable({ providedIn: 'root' })
export class EarlyReads {
  private readonly http = inject(HttpClient);
  private readonly lastVisit = inject(LastVisit);
  /** Each read started lately, and whether its screen took it (a read is started once). */
  private readonly started = new Map<
    string,
    { answer: Observable<HttpEvent<unknown>>; taken: boolean }
  >();

  start(reads: readonly ScreenRead[]): void {
    for (const read of reads) {
      const request = readRequest(read, new HttpContext().set(earlyRead, true));
      const key = request.urlWithParams;
      if (this.started.has(key)) continue;
      const answer = this.http.request(request).pipe(shareReplay());
      const entry = { answer, taken: false };
      this.started.set(key, entry);
      // Subscribed here so the request leaves now; the screen takes the answer when it asks.
      answer.subscribe({
        next: (event) => {
          if (read.paged && event instanceof HttpResponse) this.startPages(read, event.body);
        },
        error: () => undefined,
      });
      if (read.paged) void this.lastVisit.hint(key).then((kept) => this.startPages(read, kept));
      setTimeout(() => {
        if (this.started.get(key) === entry) this.started.delete(key);
      }, keptFor);
    }
  }

  /** Starts the pages after the first that a list answer's `total` implies. */
  private startPages(read: ScreenRead, first: unknown): void {
    this.start(pagesAfter(read, first));
  }

  /** The early read of this request, if one was started and not yet taken. */
  take(request: HttpRequest<unknown>): Observable<HttpEvent<unknown>> | undefined {
    if (request.method !== 'GET' || request.context.get(earlyRead)) return undefined;
    const entry = this.started.get(request.urlWithParams);
    if (!entry || entry.taken) return undefined;
    entry.taken = true;
    return entry.answer;
  }
}

/** Answers a screen's read from the early read of the same URL, when one is under way. */
export const earlyReadsInterceptor: HttpInterceptorFn = (request, next) =>
  inject(EarlyReads).take(request) ?? next(request);
