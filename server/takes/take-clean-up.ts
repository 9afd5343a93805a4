import { Cron } from 'croner';
import type { Services } from '../services';
import { removeExpiredTakes } from './takes-service';

/**
 * Removes expired takes once a day at 03:15 in the server's time zone, and once shortly after
 * start (a server that was down at 03:15 catches up). Answers how to stop it.
 */
export function startTakeCleanUp(services: Services): { stop(): Promise<void> } {
  let running: Promise<unknown> | undefined;
  let stopped = false;
  const run = () => {
    if (stopped || running) return;
    running = removeExpiredTakes(services.db, services.config.dataDir)
      .then((removed) => {
        if (removed > 0) services.logger.info({ removed }, 'expired takes removed');
      })
      .catch((error: unknown) => {
        if (!stopped) services.logger.warn({ err: error }, 'expired takes could not be removed');
      })
      .finally(() => {
        running = undefined;
      });
  };
  const job = new Cron('15 3 * * *', { unref: true }, run);
  const first = setTimeout(run, 5_000);
  first.unref();
  return {
    async stop() {
      stopped = true;
      job.stop();
      clearTimeout(first);
      await running;
    },
  };
}
