const dayFormat = new Intl.DateTimeFormat('en-US', {
  month: 'short',
  day: 'numeric',
  year: 'numeric',
  timeZone: 'UTC',
});

const calendarDate = /^\d{4}-\d{2}-\d{2}$/;

/**
 * A day as a reader expects it, 'Dec 2, 2026'. A bare calendar date (2026-12-02) is read as
 * that day wherever the reader is (never as midnight UTC shifted to the evening before); a moment
 * (an ISO 8601 date and time) shows its day in UTC. Null when the text is neither.
 */
export function dayText(value: string): string | null {
  const date = new Date(calendarDate.test(value) ? `${value}T00:00:00Z` : value);
  return Number.isNaN(date.getTime()) ? null : dayFormat.format(date);
}
