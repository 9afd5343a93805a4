import { usualTimeZones } from '../core/district/time-zones';

/** The days a schedule offers, as a cron day-of-week field and in words (0 is Sunday in cron). */
export const scheduleDays = [
  { field: '1', label: 'Monday' },
  { field: '2', label: 'Tuesday' },
  { field: '3', label: 'Wednesday' },
  { field: '4', label: 'Thursday' },
  { field: '5', label: 'Friday' },
  { field: '6', label: 'Saturday' },
  { field: '0', label: 'Sunday' },
  { field: '1-5', label: 'weekday (Monday to Friday)' },
  { field: '*', label: 'day' },
] as const;

/** The time zones the form offers first; the district's own comes first. */
export const scheduleTimeZones: readonly string[] = [...usualTimeZones, 'UTC'];

/** The five-field cron expression for "every <day> at <HH:MM>". */
export function cronFor(dayField: string, time: string): string {
  const [hour, minute] = time.split(':').map(Number);
  return `${minute ?? 0} ${hour ?? 0} * * ${dayField}`;
}

/** A cron expression in words when it is one the form makes, else the expression itself. */
export function describeCron(cron: string): string {
  const match = /^(\d{1,2}) (\d{1,2}) \* \* (\S+)$/.exec(cron.trim());
  const day = match && scheduleDays.find((choice) => choice.field === match[3]);
  if (!match || !day) return `On the cron schedule “${cron}”`;
  const time = `${match[2]!.padStart(2, '0')}:${match[1]!.padStart(2, '0')}`;
  return `Every ${day.label} at ${time}`;
}
