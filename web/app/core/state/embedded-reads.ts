import { DOCUMENT, Injectable, inject } from '@angular/core';
import { HttpResponse, type HttpInterceptorFn, type HttpRequest } from '@angular/common/http';
import { of } from 'rxjs';
import { embeddedReadsId, type EmbeddedRead } from '@shared/api/entry-reads';
import { keptFor, readKey } from './early-reads';

/**
 * Answers that came with the index page (a `<script type="application/json">` data block, HTML
 * Living Standard, "Data blocks"), read by the server for the signed-in user through the same
 * services and rules as the API. Each answers the first request for the same URL, once; the block
 * is removed from the page as it is read, and what is not asked for soon is dropped.
 */
@Injectable({ providedIn: 'root' })
export class EmbeddedReads {
  private readonly answers = new Map<string, unknown>();

  constructor() {
    const block = inject(DOCUMENT).getElementById(embeddedReadsId);
    if (!block) return;
    block.remove();
    let reads: EmbeddedRead[] = [];
    try {
      reads = JSON.parse(block.textContent ?? '[]') as EmbeddedRead[];
    } catch {
      return;
    }
    for (const read of reads) this.answers.set(readKey(read), read.body);
    // An answer not asked for soon is dropped rather than given stale (as an early read is).
    setTimeout(() => this.answers.clear(), keptFor);
  }

  /** The answer that came with the page for this request, if there is one not yet taken. */
  take(request: HttpRequest<unknown>) {
    if (request.method !== 'GET' || request.responseType !== 'json') return undefined;
    const key = request.urlWithParams;
    if (!this.answers.has(key)) return undefined;
    const body = this.answers.get(key);
    this.answers.delete(key);
    return of(new HttpResponse({ body, status: 200, statusText: 'OK', url: key }));
  }
}

/**
 * Answers a read from the page's embedded answers when there is one, in the server's place: the
 * last interceptor, so the answer goes back through the others (the device's copy kept for
 * offline use, the session check) as the server's own would.
 */
export const embeddedReadsInterceptor: HttpInterceptorFn = (request, next) =>
  inject(EmbeddedReads).take(request) ?? next(request);
