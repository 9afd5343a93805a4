import { afterEach, describe, expect, it, vi } from 'vitest';

const originalZone = process.env['TZ'];
afterEach(() => {
  process.env['TZ'] = originalZone;
});

describe('dayText', () => {
  // Unicode CLDR, English (en) medium date pattern "MMM d, y".
  it('should write a calendar date in the US medium style', async () => {
    const { dayText } = await import('./day-text');
    expect(dayText('2026-03-07')).toBe('Mar 7, 2026');
    expect(dayText('2027-01-31')).toBe('Jan 31, 2027');
  });

  it('should keep a calendar date on its own day west and east of Greenwich', async () => {
    for (const zone of ['America/Los_Angeles', 'Pacific/Auckland']) {
      process.env['TZ'] = zone;
      vi.resetModules();
      const { dayText } = await import('./day-text');
      expect(dayText('2026-12-02')).toBe('Dec 2, 2026');
    }
  });

  it('should show a moment on its day in UTC', async () => {
    const { dayText } = await import('./day-text');
    expect(dayText('2026-12-02T23:30:00Z')).toBe('Dec 2, 2026');
    expect(dayText('2026-12-02T23:30:00-05:00')).toBe('Dec 3, 2026');
  });

  it('should answer null for text that is no date', async () => {
    const { dayText } = await import('./day-text');
    expect(dayText('not a date')).toBeNull();
    expect(dayText('')).toBeNull();
  });
});
