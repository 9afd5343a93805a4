import { describe, expect, it } from 'vitest';
import { dayIn } from '../district/district-clock';
import { dayBefore, nextRunAfter, scheduledPeriod } from './schedule-times';

describe('nextRunAfter', () => {
  it('should answer the next Monday 07:00 in Los Angeles when the expression is 0 7 * * 1', () => {
    // Thursday 3 December 2026, noon UTC; Los Angeles is on UTC−8 (standard time) then.
    const next = nextRunAfter('0 7 * * 1', 'America/Los_Angeles', new Date('2026-12-03T12:00:00Z'));
    // POSIX crontab: minute hour day-of-month month day-of-week, with 1 = Monday.
    expect(next?.toISOString()).toBe('2026-12-07T15:00:00.000Z');
  });

  it('should follow daylight saving time when the zone changes its offset', () => {
    // 2027-03-14 is the second Sunday of March: US daylight time starts (15 U.S.C. § 260a).
    const next = nextRunAfter('0 7 * * 1', 'America/Los_Angeles', new Date('2027-03-10T12:00:00Z'));
    expect(next?.toISOString()).toBe('2027-03-15T14:00:00.000Z');
  });

  it('should throw a 400 error when the expression or the zone cannot be read', () => {
    expect(() => nextRunAfter('0 7 * *', 'UTC', new Date())).toThrow(/five cron fields/);
    expect(() => nextRunAfter('0 25 * * 1', 'UTC', new Date())).toThrow(/cannot be read/);
    expect(() => nextRunAfter('0 7 * * 1', 'Nowhere/Special', new Date())).toThrow(
      /not a time zone/,
    );
  });
});

describe('scheduledPeriod', () => {
  it('should cover the week before a Monday run when the period is 7 days', () => {
    expect(scheduledPeriod(new Date('2026-11-16T15:00:00Z'), 'America/Los_Angeles', 7)).toEqual({
      from: '2026-11-09',
      to: '2026-11-15',
    });
  });

  it('should read the run day in the schedule zone when UTC is already on the next day', () => {
    // 04:00 UTC on 17 November is still 16 November, 20:00, in Los Angeles.
    expect(dayIn(new Date('2026-11-17T04:00:00Z'), 'America/Los_Angeles')).toBe('2026-11-16');
    expect(dayBefore('2027-03-01')).toBe('2027-02-28');
  });
});
