import { Pipe, type PipeTransform } from '@angular/core';
import { dayText } from '@shared/calendar/day-text';

const calendarDate = /^\d{4}-\d{2}-\d{2}$/;

/**
 * Dates, times and counts as the screens show them, through the browser's Intl (US English,
 * the district's language of record). Our own small pipes instead of Angular's DatePipe and
 * DecimalPipe, whose locale tables would otherwise ride in the initial bundle.
 */
const formats = {
  /** Dec 2, 2026 */
  date: new Intl.DateTimeFormat('en-US', { month: 'short', day: 'numeric', year: 'numeric' }),
  /** Dec 2, 2026, 1:25 PM */
  dateTime: new Intl.DateTimeFormat('en-US', {
    month: 'short',
    day: 'numeric',
    year: 'numeric',
    hour: 'numeric',
    minute: '2-digit',
  }),
  /** Dec 2, 2026, 1:25:07 PM */
  dateTimeSeconds: new Intl.DateTimeFormat('en-US', {
    month: 'short',
    day: 'numeric',
    year: 'numeric',
    hour: 'numeric',
    minute: '2-digit',
    second: '2-digit',
  }),
};

export type WhenFormat = keyof typeof formats;

/** A date or time stamp in one of our formats; empty for a missing or unreadable value. */
export function formatWhen(
  value: string | number | Date | null | undefined,
  format: WhenFormat = 'date',
): string {
  if (value === null || value === undefined || value === '') return '';
  // A bare calendar date (2026-12-02) is that day, not midnight UTC shifted to the day before.
  if (typeof value === 'string' && calendarDate.test(value)) return dayText(value) ?? '';
  const date = new Date(value);
  return Number.isNaN(date.getTime()) ? '' : formats[format].format(date);
}

const counting = new Intl.NumberFormat('en-US');

/** A count with thousands separators: 12,480. */
export function formatCount(value: number | null | undefined): string {
  return value === null || value === undefined ? '' : counting.format(value);
}

@Pipe({ name: 'when' })
export class WhenPipe implements PipeTransform {
  transform(value: string | number | Date | null | undefined, format: WhenFormat = 'date'): string {
    return formatWhen(value, format);
  }
}

@Pipe({ name: 'count' })
export class CountPipe implements PipeTransform {
  transform(value: number | null | undefined): string {
    return formatCount(value);
  }
}
