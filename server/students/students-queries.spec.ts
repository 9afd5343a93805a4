import { describe, expect, it } from 'vitest';
import { pagePlan } from './students-queries';

describe('pagePlan', () => {
  it('should read pages up to the middle forwards and later pages backwards from the end', () => {
    expect(pagePlan({ offset: 0, limit: 100 }, 50_000, { search: false })).toEqual({
      offset: 0,
      limit: 100,
      reversed: false,
      fenced: false,
    });
    // Rows 48,000–48,099 of 50,000 are rows 1,900–1,999 counted from the end.
    expect(pagePlan({ offset: 48_000, limit: 100 }, 50_000, { search: false })).toEqual({
      offset: 1_900,
      limit: 100,
      reversed: true,
      fenced: false,
    });
  });

  it('should shorten the last page and answer nothing past the end', () => {
    expect(pagePlan({ offset: 49_950, limit: 100 }, 50_000, { search: false })).toEqual({
      offset: 0,
      limit: 50,
      reversed: true,
      fenced: false,
    });
    expect(pagePlan({ offset: 50_000, limit: 100 }, 50_000, { search: false })).toBeUndefined();
  });

  it('should gather a search’s few matches and sort them, however deep the page', () => {
    expect(pagePlan({ offset: 300, limit: 100 }, 400, { search: true })).toEqual({
      offset: 300,
      limit: 100,
      reversed: false,
      fenced: true,
    });
    expect(pagePlan({ offset: 0, limit: 100 }, 20_000, { search: true })?.fenced).toBe(false);
  });
});
