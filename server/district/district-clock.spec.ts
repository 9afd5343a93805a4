import { afterEach, describe, expect, it } from 'vitest';
import { dayIn, districtToday, useDistrictTimeZone } from './district-clock';
import { defaultDistrictTimeZone } from '@shared/api/district';

describe('districtToday', () => {
  afterEach(() => useDistrictTimeZone(defaultDistrictTimeZone));

  // IANA time zone database: America/Denver keeps Mountain Standard Time, UTC−7, in December;
  // Pacific/Auckland keeps NZDT, UTC+13, in December.
  it('should count the day in the district time zone when UTC has moved on to the next day', () => {
    const moment = new Date('2026-12-04T03:00:00Z');
    expect(dayIn(moment, 'America/Denver')).toBe('2026-12-03');
    expect(dayIn(moment, 'Pacific/Auckland')).toBe('2026-12-04');
    useDistrictTimeZone('America/Denver');
    expect(districtToday(moment)).toBe('2026-12-03');
    useDistrictTimeZone('Pacific/Auckland');
    expect(districtToday(new Date('2026-12-04T12:00:00Z'))).toBe('2026-12-05');
  });
});
