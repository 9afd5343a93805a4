// Angular's packages are partially compiled: the JIT compiler links them outside a build.
import '@angular/compiler';
import { HttpParams } from '@angular/common/http';
import { describe, expect, it } from 'vitest';
import { sessionUserId } from '../offline/last-visit';
import { readKey } from './early-reads';
import { pagesAfter } from '@shared/api/entry-reads';

describe('readKey and pagesAfter', () => {
  it('should name each later page as the screen asks for it, so the device copy finds its answers', () => {
    const first = { url: '/api/pass-offs', params: { ensembleId: 2, limit: 1000, offset: 0 } };
    const pages = pagesAfter(first, { rows: [], total: 2300 });
    expect(pages.map((page) => page.params?.['offset'])).toEqual([1000, 2000]);
    // The screen's request for a page: the query with `limit` and `offset` after it.
    const asked = new HttpParams({ fromObject: { ensembleId: 2, limit: 1000, offset: 2000 } });
    expect(readKey(pages[1]!)).toBe(`/api/pass-offs?${asked.toString()}`);
    expect(readKey(first)).toBe('/api/pass-offs?ensembleId=2&limit=1000&offset=0');
  });

  it('should ask for no later page when the first holds the whole list or tells no total', () => {
    const first = { url: '/api/pass-offs', params: { ensembleId: 2, limit: 1000, offset: 0 } };
    expect(pagesAfter(first, { rows: [], total: 1000 })).toEqual([]);
    expect(pagesAfter(first, { rows: [] })).toEqual([]);
    expect(pagesAfter({ url: '/api/ladder' }, { total: 5000 })).toEqual([]);
  });
});

describe('sessionUserId', () => {
  // The cookie string as document.cookie gives it: "name=value" pairs joined by "; " (RFC 6265 §5.4).
  it.each([
    ['theme=dark; tuttiboard.user=42; x=1', 42],
    ['tuttiboard.user=7', 7],
    ['', null],
    ['other.tuttiboard.user=42', null],
    ['tuttiboard.user=abc', null],
  ])('should read %j as the user %j', (cookies, user) => {
    expect(sessionUserId(cookies)).toBe(user);
  });
});
