/** A job the server runs on a timer. */
export interface IntervalJob {
  /** Stops the timer and waits for a run under way to end. */
  stop(): Promise<void>;
}

/** How a job is run: what it does, how often, and where a failed run is told. */
export interface IntervalJobOptions {
  run: () => Promise<unknown>;
  intervalMilliseconds: number;
  /** A first run this soon after the start, before the first interval has passed. */
  firstAfterMilliseconds?: number;
  /** Told of a run that failed, unless the job has been stopped since. */
  onError: (error: unknown) => void;
}

/**
 * Runs a job every interval, one run at a time: a tick while a run is under way is skipped. The
 * timers do not keep the process alive (Node.js timers, `timeout.unref()`).
 */
export function startIntervalJob(options: IntervalJobOptions): IntervalJob {
  let stopped = false;
  let running: Promise<unknown> | undefined;
  const tick = () => {
    if (stopped || running) return;
    running = options
      .run()
      .catch((error: unknown) => {
        if (!stopped) options.onError(error);
      })
      .finally(() => {
        running = undefined;
      });
  };
  const timer = setInterval(tick, options.intervalMilliseconds);
  timer.unref();
  const first =
    options.firstAfterMilliseconds === undefined
      ? undefined
      : setTimeout(tick, options.firstAfterMilliseconds);
  first?.unref();
  return {
    async stop() {
      stopped = true;
      clearInterval(timer);
      clearTimeout(first);
      await running;
    },
  };
}
