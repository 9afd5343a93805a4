import { eq } from 'drizzle-orm';
import { oneRosterSync } from '../db/schema/index';
import { districtTimeZone } from '../district/district-clock';
import type { Services } from '../services';
import { runSync } from './sync-service';
import { startIntervalJob } from '../core/interval-job';

/** A moment as 'YYYY-MM-DD HH:MM' in a time zone (en-CA and a 24-hour clock, Unicode CLDR). */
function localMinute(moment: Date, timeZone: string): string {
  const parts = new Intl.DateTimeFormat('en-CA', {
    timeZone,
    year: 'numeric',
    month: '2-digit',
    day: '2-digit',
    hour: '2-digit',
    minute: '2-digit',
    hourCycle: 'h23',
  }).formatToParts(moment);
  const part = (type: string) => parts.find((entry) => entry.type === type)?.value ?? '00';
  return `${part('year')}-${part('month')}-${part('day')} ${part('hour')}:${part('minute')}`;
}

/**
 * Whether the nightly sync is due: it is enabled, today's run time (in the district's zone) has
 * come, and no run (committed or failed) has started since. A failed run is tried again at the
 * next day's time.
 */
export function syncDue(
  sync: { enabled: boolean; runAt: string; lastRunAt: Date | null },
  now: Date,
  timeZone: string,
): boolean {
  if (!sync.enabled) return false;
  const today = localMinute(now, timeZone).slice(0, 10);
  const scheduled = `${today} ${sync.runAt}`;
  if (localMinute(now, timeZone) < scheduled) return false;
  return sync.lastRunAt === null || localMinute(sync.lastRunAt, timeZone) < scheduled;
}

/** Checks once a minute whether the nightly OneRoster sync is due, and runs it. */
export function startSyncScheduler(services: Services, intervalMilliseconds = 60_000) {
  return startIntervalJob({
    intervalMilliseconds,
    run: async () => {
      const [sync] = await services.db.select().from(oneRosterSync).where(eq(oneRosterSync.id, 1));
      if (!sync || !syncDue(sync, new Date(), districtTimeZone())) return;
      const run = await runSync(services.database, services.config, {
        dryRun: false,
        skipInvalid: false,
        actor: null,
        via: 'api',
      });
      if (run.failure) services.logger.warn({ reason: run.failure }, 'the OneRoster sync failed');
    },
    onError: (error) => services.logger.warn({ err: error }, 'the OneRoster sync could not run'),
  });
}
