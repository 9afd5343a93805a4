import { defaultDistrictTimeZone } from '@shared/api/district';

// One district per installation, so one zone per process; district-queries.ts keeps it current.
let zone = defaultDistrictTimeZone;

/** Sets the time zone the district's days are counted in (from its record). */
export function useDistrictTimeZone(timeZone: string): void {
  zone = timeZone;
}

/** The time zone the district's days are counted in. */
export function districtTimeZone(): string {
  return zone;
}

/** The calendar day (YYYY-MM-DD) a moment falls on in a time zone. */
export function dayIn(moment: Date, timeZone: string): string {
  // The en-CA locale writes dates as YYYY-MM-DD (Unicode CLDR).
  return new Intl.DateTimeFormat('en-CA', {
    timeZone,
    year: 'numeric',
    month: '2-digit',
    day: '2-digit',
  }).format(moment);
}

/** Today (YYYY-MM-DD) in the district's time zone: the day due dates and "this week" are read against. */
export function districtToday(now: Date = new Date()): string {
  return dayIn(now, zone);
}
