import type { Services } from '../services';
import { startMailWorker } from '../mail/mail-worker';
import { startReportScheduler } from './report-scheduler';
import { startTakeCleanUp } from '../takes/take-clean-up';
import { startSyncScheduler } from '../oneroster/sync-scheduler';

/**
 * Starts what runs beside the requests: the mail worker that sends the outbox, the report
 * scheduler, the daily clean-up of takes and the nightly OneRoster sync. Answers how to stop them; the server and the test harness call it on close.
 */
export function startBackgroundWork(services: Services): () => Promise<void> {
  const mailWorker = startMailWorker(services);
  const scheduler = startReportScheduler(services);
  const takeCleanUp = startTakeCleanUp(services);
  const rosterSync = startSyncScheduler(services);
  let stopping: Promise<void> | undefined;
  return () =>
    (stopping ??= (async () => {
      await scheduler.stop();
      await takeCleanUp.stop();
      await rosterSync.stop();
      await mailWorker.stop();
    })());
}
