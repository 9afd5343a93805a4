import { afterEach, describe, expect, it, vi } from 'vitest';
import { formatCount, formatWhen } from './formats';

const originalZone = process.env['TZ'];
afterEach(() => {
  process.env['TZ'] = originalZone;
});

describe('formatWhen', () => {
  // Unicode CLDR, English (en) medium date pattern "MMM d, y" and short time "h:mm a".
  it('should write dates and times in the US medium style', async () => {
    process.env['TZ'] = 'UTC';
    vi.resetModules();
    const { formatWhen } = await import('./formats');
    expect(formatWhen('2026-03-07T15:04:09Z')).toBe('Mar 7, 2026');
    expect(formatWhen('2026-03-07T15:04:09Z', 'dateTime')).toBe('Mar 7, 2026, 3:04 PM');
    expect(formatWhen('2026-03-07T15:04:09Z', 'dateTimeSeconds')).toBe('Mar 7, 2026, 3:04:09 PM');
  });

  it('should keep a calendar date on its own day west of Greenwich', async () => {
    process.env['TZ'] = 'America/Los_Angeles';
    // The formats take the zone when the module loads, as a browser's page does.
    vi.resetModules();
    const inCalifornia = await import('./formats');
    // As an instant, 2026-12-02 is midnight UTC: the evening of December 1 in California.
    expect(inCalifornia.formatWhen(new Date('2026-12-02'))).toBe('Dec 1, 2026');
    expect(inCalifornia.formatWhen('2026-12-02')).toBe('Dec 2, 2026');
  });

  it('should show nothing for a missing or unreadable value', () => {
    expect(formatWhen(null)).toBe('');
    expect(formatWhen(undefined)).toBe('');
    expect(formatWhen('not a date')).toBe('');
  });
});

describe('formatCount', () => {
  // Unicode CLDR, English: grouping separator "," every three digits.
  it('should group thousands', () => {
    expect(formatCount(1234567)).toBe('1,234,567');
    expect(formatCount(0)).toBe('0');
    expect(formatCount(null)).toBe('');
  });
});
