import { AsyncLocalStorage } from 'node:async_hooks';
import type { PGlite } from '@electric-sql/pglite';

/** When the request a piece of work belongs to arrived (`performance.now()`), if any. */
const arrival = new AsyncLocalStorage<number>();

/** Runs `work` (a request's handling) with its arrival time, which orders its statements. */
export function withArrival<Result>(arrivedAt: number, work: () => Result): Result {
  return arrival.run(arrivedAt, work);
}

interface Waiter {
  arrivedAt: number;
  order: number;
  admit: () => void;
}

/**
 * Puts the embedded engine's callers in the order their requests arrived. PGlite runs one
 * statement (or one transaction) at a time and queues the rest first come, first served, one
 * statement at a time: a request of ten statements goes to the back of the queue ten times, so
 * under load the pages with most statements (the Overview, a pass-off batch) waited many times
 * longer than the rest. Here the statement of the oldest request goes first, so a request that
 * has begun is finished before one that came after it starts, and each waits about as long as
 * the requests ahead of it take: the fair queue of Little's law. Work outside a request
 * (housekeeping, the mail worker) counts as arriving when it asks. Wraps `query`, `exec` and
 * `transaction` of the instance, PGlite's public entry points; the statements of a transaction
 * run inside it.
 */
export function inArrivalOrder(pglite: PGlite): void {
  const waiting: Waiter[] = [];
  let busy = false;
  let order = 0;
  const acquire = (): Promise<void> | void => {
    if (!busy) {
      busy = true;
      return;
    }
    const arrivedAt = arrival.getStore() ?? performance.now();
    return new Promise<void>((admit) => {
      const waiter = { arrivedAt, order: order++, admit };
      // Sorted by arrival, then by when they asked: a binary search for the place.
      let low = 0;
      let high = waiting.length;
      while (low < high) {
        const middle = (low + high) >>> 1;
        const other = waiting[middle]!;
        if (
          other.arrivedAt < arrivedAt ||
          (other.arrivedAt === arrivedAt && other.order < waiter.order)
        )
          low = middle + 1;
        else high = middle;
      }
      waiting.splice(low, 0, waiter);
    });
  };
  const admitNext = () => {
    const next = waiting.shift();
    if (next) next.admit();
    else busy = false;
  };
  // With others waiting, the next is chosen a turn later: by then the request whose statement
  // just ended has asked for its next one (its code runs on from the answer in microtasks), and
  // that one goes ahead of the requests that came after it.
  const release = () => {
    if (waiting.length === 0) busy = false;
    else setImmediate(admitNext);
  };
  const gated = <Method extends (...args: never[]) => Promise<unknown>>(method: Method): Method =>
    (async (...args: Parameters<Method>) => {
      await acquire();
      try {
        return await method.apply(pglite, args);
      } finally {
        release();
      }
    }) as Method;
  pglite.query = gated(pglite.query);
  pglite.exec = gated(pglite.exec);
  pglite.transaction = gated(pglite.transaction);
}

const arrivedAtKey = Symbol('arrived at');

/**
 * Express middleware: notes when the request arrived and runs the rest of its handling in that
 * arrival's order (see {@link inArrivalOrder}). Mounted first, and again after the middleware
 * that read the body or the session: their callbacks come from the socket's events, outside the
 * request's async context, so the order is taken up again from the note on the request.
 */
export function arrivalOrder(
  request: object,
  _response: unknown,
  next: (error?: unknown) => void,
): void {
  const noted = request as { [arrivedAtKey]?: number };
  noted[arrivedAtKey] ??= performance.now();
  withArrival(noted[arrivedAtKey], next);
}
