import { describe, expect, it } from 'vitest';
import { listParameters, nextCursor } from './grid-query';

describe('nextCursor', () => {
  // RFC 8288 §3: Link = link-value *( "," link-value ); link-value = "<" URI-Reference ">" *( ";" link-param ).
  it('should read the after parameter of the rel="next" link', () => {
    expect(
      nextCursor('</api/students?sort=grade%3Aasc&limit=100&after=eyJzIjoxfQ>; rel="next"'),
    ).toBe('eyJzIjoxfQ');
    expect(nextCursor('</api/x?after=A1>; rel="prev", </api/x?after=B2>; rel=next')).toBe('B2');
  });

  it('should answer nothing without a next link', () => {
    expect(nextCursor(null)).toBeUndefined();
    expect(nextCursor('</api/x?after=A1>; rel="prev"')).toBeUndefined();
    expect(nextCursor('</api/x?limit=100>; rel="next"')).toBeUndefined();
  });
});

describe('listParameters', () => {
  it('should leave out empty filters and always send the page', () => {
    expect(
      listParameters({
        quickSearch: ' ada ',
        filters: { schoolId: 3, grade: '' },
        offset: 200,
        limit: 100,
      }),
    ).toEqual({ q: 'ada', schoolId: '3', offset: '200', limit: '100' });
  });
});
