/** A day as YYYY-MM-DD in the browser's own calendar (not UTC, which is tomorrow by evening). */
export function localIsoDate(date: Date): string {
  const month = String(date.getMonth() + 1).padStart(2, '0');
  const day = String(date.getDate()).padStart(2, '0');
  return `${date.getFullYear()}-${month}-${day}`;
}

/** The period of the last `days` days, today included. */
export function lastDays(days: number, today = new Date()): { from: string; to: string } {
  const from = new Date(today.getFullYear(), today.getMonth(), today.getDate() - (days - 1));
  return { from: localIsoDate(from), to: localIsoDate(today) };
}

/** A moment as a director reads it, in a time zone: "Mon, Dec 7, 07:00". */
export function momentText(iso: string | null, timeZone?: string): string {
  if (!iso) return '—';
  return new Intl.DateTimeFormat('en-US', {
    weekday: 'short',
    month: 'short',
    day: 'numeric',
    hour: '2-digit',
    minute: '2-digit',
    hourCycle: 'h23',
    timeZone,
  }).format(new Date(iso));
}
