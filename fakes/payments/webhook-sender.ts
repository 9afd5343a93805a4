import { createHmac } from 'node:crypto';
import type { PaymentEvent } from './payment-objects.js';

/**
 * The signature header of one delivery: `t=<unix seconds>,v1=<hex HMAC-SHA256 of "t.payload"
 * under the endpoint's signing secret>`, the scheme the service publishes for its webhooks.
 */
export function signatureHeader(payload: string, secret: string, timestamp: number): string {
  const signature = createHmac('sha256', secret)
    .update(`${timestamp}.${payload}`, 'utf8')
    .digest('hex');
  return `t=${timestamp},v1=${signature}`;
}

/** One attempt to deliver an event. */
export interface Delivery {
  eventId: string;
  type: string;
  attempt: number;
  at: string;
  /** The HTTP status the endpoint answered, or null when it could not be reached. */
  status: number | null;
  error: string | null;
}

/** How the sender behaves. */
export interface WebhookSenderOptions {
  secret: string;
  /** Where events go; undefined keeps them queued until one is set. */
  url?: string;
  /** Waits before each retry, in milliseconds; the last one repeats until `maxAttempts`. */
  retryDelaysMs?: number[];
  maxAttempts?: number;
}

interface Pending {
  event: PaymentEvent;
  payload: string;
  attempt: number;
  timer?: NodeJS.Timeout;
}

/**
 * Sends events to the configured endpoint, one POST per event, signed afresh on every attempt
 * (a new timestamp each time), and retries with growing waits while the endpoint does not answer
 * 2xx. Events can be held (kept queued) and released, and any sent event sent again, so tests can
 * stage duplicates, replays and races.
 */
export class WebhookSender {
  private readonly pending = new Map<string, Pending>();
  private readonly sent = new Map<string, PaymentEvent>();
  private readonly log: Delivery[] = [];
  private held = false;
  private closed = false;
  private inFlight = new Set<Promise<void>>();
  url: string | undefined;

  constructor(private readonly options: WebhookSenderOptions) {
    this.url = options.url;
  }

  /** Queues an event for delivery. */
  send(event: PaymentEvent): void {
    const payload = JSON.stringify(event, null, 2);
    this.sent.set(event.id, event);
    const pending: Pending = { event, payload, attempt: 0 };
    this.pending.set(event.id, pending);
    if (!this.held) this.schedule(pending, 0);
  }

  /** Sends an event again, as the service does when asked to resend one. */
  resend(eventId: string): boolean {
    const event = this.sent.get(eventId);
    if (!event) return false;
    const pending: Pending = { event, payload: JSON.stringify(event, null, 2), attempt: 0 };
    void this.attempt(pending);
    return true;
  }

  /** Keeps new events queued until `release()`. */
  hold(): void {
    this.held = true;
  }

  /** Delivers everything held, in the order it happened. */
  release(): void {
    this.held = false;
    for (const pending of this.pending.values()) if (!pending.timer) this.schedule(pending, 0);
  }

  /** Every delivery attempt so far, oldest first. */
  deliveries(): Delivery[] {
    return [...this.log];
  }

  /** Every event created, oldest first. */
  events(): PaymentEvent[] {
    return [...this.sent.values()];
  }

  /** Events not yet answered 2xx. */
  undelivered(): string[] {
    return [...this.pending.keys()];
  }

  /** Resolves once nothing is in flight and nothing is queued to go at once. */
  async settled(): Promise<void> {
    while (this.inFlight.size > 0) await Promise.all([...this.inFlight]);
  }

  close(): void {
    this.closed = true;
    for (const pending of this.pending.values()) clearTimeout(pending.timer);
  }

  private schedule(pending: Pending, delay: number): void {
    if (this.closed) return;
    pending.timer = setTimeout(() => {
      pending.timer = undefined;
      if (this.held) return;
      void this.attempt(pending);
    }, delay);
    pending.timer.unref();
  }

  private attempt(pending: Pending): Promise<void> {
    const run = this.deliver(pending).finally(() => this.inFlight.delete(run));
    this.inFlight.add(run);
    return run;
  }

  private async deliver(pending: Pending): Promise<void> {
    if (this.closed) return;
    pending.attempt += 1;
    const record: Delivery = {
      eventId: pending.event.id,
      type: pending.event.type,
      attempt: pending.attempt,
      at: new Date().toISOString(),
      status: null,
      error: null,
    };
    this.log.push(record);
    if (!this.url) {
      record.error = 'no webhook endpoint configured';
    } else {
      try {
        const response = await fetch(this.url, {
          method: 'POST',
          headers: {
            'Content-Type': 'application/json; charset=utf-8',
            'User-Agent': 'tuttiboard-payments-fake/1.0',
            'Stripe-Signature': signatureHeader(
              pending.payload,
              this.options.secret,
              Math.floor(Date.now() / 1000),
            ),
          },
          body: pending.payload,
          signal: AbortSignal.timeout(10_000),
        });
        record.status = response.status;
        await response.arrayBuffer().catch(() => undefined);
        if (response.ok) {
          this.pending.delete(pending.event.id);
          return;
        }
      } catch (error) {
        record.error = error instanceof Error ? error.message : String(error);
      }
    }
    const delays = this.options.retryDelaysMs ?? [1_000, 5_000, 30_000, 120_000, 600_000];
    const maxAttempts = this.options.maxAttempts ?? 20;
    if (pending.attempt >= maxAttempts || !this.pending.has(pending.event.id)) {
      this.pending.delete(pending.event.id);
      return;
    }
    this.schedule(pending, delays[Math.min(pending.attempt - 1, delays.length - 1)] ?? 1_000);
  }
}
