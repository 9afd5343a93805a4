import { HttpClient, HttpParams, httpResource, type HttpResourceRef } from '@angular/common/http';
import { inject } from '@angular/core';
import type { Observable } from 'rxjs';
import type { z } from 'zod';
import { parsedWith } from '../parse';

/** A list route's query: filters, search text, sort and page. */
export type ListQuery = Record<string, string | number | boolean>;

/** What `httpResource` is asked for: an address, with query parameters or not; none while idle. */
type ResourceRequest = string | { url: string; params: ListQuery } | undefined;

/**
 * What every data class (`SchoolData`, `FleetLoans`, …) is built on: reads as `httpResource`s or
 * `HttpClient` streams and writes as `HttpClient` observables, each answer parsed by the shared
 * zod schema, so the web trusts only checked data. A data class extends it and names its routes.
 */
export abstract class ApiData {
  protected readonly http = inject(HttpClient);

  /** A GET of one record or a page of a list route (pickers, panels), `query` as parameters. */
  protected read<Schema extends z.ZodType>(
    url: string,
    schema: Schema,
    query: ListQuery = {},
  ): Observable<z.infer<Schema>> {
    return this.http
      .get(url, { params: new HttpParams({ fromObject: query }) })
      .pipe(parsedWith(schema));
  }

  /** A read that follows `request()`: read again whenever it changes, idle while undefined. */
  protected resource<Schema extends z.ZodType>(
    request: () => ResourceRequest,
    schema: Schema,
  ): HttpResourceRef<z.infer<Schema> | undefined> {
    return httpResource(
      () => {
        const asked = request();
        return typeof asked === 'string' ? { url: asked } : asked;
      },
      { parse: (body) => schema.parse(body) as z.infer<Schema> },
    );
  }

  /** A write (POST, PATCH, PUT) whose answer is parsed by `schema`. */
  protected write<Schema extends z.ZodType>(
    method: 'POST' | 'PATCH' | 'PUT',
    url: string,
    body: unknown,
    schema: Schema,
  ): Observable<z.infer<Schema>> {
    return this.http.request(method, url, { body }).pipe(parsedWith(schema));
  }
}
