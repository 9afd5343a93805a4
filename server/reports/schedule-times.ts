import { Cron } from 'croner';
import { badRequest } from '../core/errors';
import { dayIn } from '../district/district-clock';

/** Whether the name is an IANA time zone this runtime knows. */
function knownTimeZone(timeZone: string): boolean {
  try {
    new Intl.DateTimeFormat('en-US', { timeZone });
    return true;
  } catch {
    return false;
  }
}

/**
 * The first time after `after` that the five-field cron expression matches, read in the time
 * zone; throws 400 for an expression or a zone that cannot be read.
 */
export function nextRunAfter(cron: string, timeZone: string, after: Date): Date | null {
  if (!knownTimeZone(timeZone)) {
    throw badRequest(`${timeZone} is not a time zone.`, [
      { field: 'timeZone', message: 'Use an IANA time zone name such as America/Los_Angeles.' },
    ]);
  }
  if (cron.trim().split(/\s+/).length !== 5) {
    throw badRequest(
      'A schedule is five cron fields: minute hour day-of-month month day-of-week.',
      [{ field: 'cron', message: 'Write five fields, such as 0 7 * * 1 for Mondays at 07:00.' }],
    );
  }
  let job: Cron;
  try {
    job = new Cron(cron, { timezone: timeZone, paused: true });
  } catch (error) {
    throw badRequest(`The cron expression cannot be read: ${(error as Error).message}`, [
      { field: 'cron', message: 'Write five fields, such as 0 7 * * 1 for Mondays at 07:00.' },
    ]);
  }
  try {
    return job.nextRun(after);
  } finally {
    job.stop();
  }
}

/** The day `days` days before a YYYY-MM-DD day. */
export function dayBefore(day: string, days = 1): string {
  const date = new Date(`${day}T00:00:00Z`);
  date.setUTCDate(date.getUTCDate() - days);
  return date.toISOString().slice(0, 10);
}

/**
 * The period a scheduled run reports on: the `periodDays` whole days before the run's local day,
 * so a Monday-morning run covers Monday to Sunday of the week before.
 */
export function scheduledPeriod(
  runAt: Date,
  timeZone: string,
  periodDays: number,
): { from: string; to: string } {
  const to = dayBefore(dayIn(runAt, timeZone));
  return { from: dayBefore(to, periodDays - 1), to };
}
