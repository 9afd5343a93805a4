/**
 * The IANA time zones (tz database names) a district's forms offer first: the United States'
 * mainland zones, Arizona's (no daylight saving time), Alaska's and Hawaii's. Any other zone can
 * be typed in.
 */
export const usualTimeZones: readonly string[] = [
  'America/Los_Angeles',
  'America/Denver',
  'America/Phoenix',
  'America/Chicago',
  'America/New_York',
  'America/Anchorage',
  'Pacific/Honolulu',
];
