import type { Services } from '../services';
import { startMailWorker } from '../mail/mail-worker';
import { startReportScheduler } from './report-scheduler';

/**
 * Starts what runs beside the requests: the mail worker that sends the outbox, and the report
 * scheduler. Answers how to stop them; the server and the test harness call it on close.
 */
export function startBackgroundWork(services: Services): () => Promise<void> {
  const mailWorker = startMailWorker(services);
  const scheduler = startReportScheduler(services);
  let stopping: Promise<void> | undefined;
  return () =>
    (stopping ??= (async () => {
      await scheduler.stop();
      await mailWorker.stop();
    })());
}
