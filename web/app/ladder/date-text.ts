import { dayText } from '@shared/calendar/day-text';

/** An ISO date (YYYY-MM-DD) as a reader expects it: 'Jan 31, 2027'. */
export function dateText(isoDate: string): string {
  return dayText(isoDate.slice(0, 10)) ?? isoDate;
}

/** Today in the browser's own time zone, as an ISO date. */
export function localToday(): string {
  const now = new Date();
  const month = String(now.getMonth() + 1).padStart(2, '0');
  const day = String(now.getDate()).padStart(2, '0');
  return `${now.getFullYear()}-${month}-${day}`;
}

/** A grade as schools write it: 'K' for kindergarten, else the number. */
export function gradeText(grade: number): string {
  return grade === 0 ? 'K' : String(grade);
}
