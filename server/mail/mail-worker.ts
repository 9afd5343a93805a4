import { eq, sql } from 'drizzle-orm';
import type { Transporter } from 'nodemailer';
import type { Database } from '../db/client';
import { rowsOf } from '../db/client';
import { outboxMessages } from '../db/schema/index';
import type { Services } from '../services';
import { createMailTransport } from './mail-transport';
import { onOutboxNudge } from './outbox';
import { districtIdentity } from '../district/district-queries';

/** How many times a message is tried before it is marked failed. */
export const maxAttempts = 8;

// Waits after attempts 1…7: 5 s, 30 s, 2 min, 10 min, 1 h, 3 h, 6 h.
const retryDelaysSeconds = [5, 30, 120, 600, 3600, 10_800, 21_600];

// A message left 'sending' this long was claimed by an instance that stopped mid-send.
const abandonedAfterSeconds = 600;

/** The wait before the next try after `attempts` failed tries, in milliseconds. */
export function retryDelay(attempts: number): number {
  const index = Math.min(Math.max(attempts, 1), retryDelaysSeconds.length) - 1;
  return retryDelaysSeconds[index]! * 1000;
}

interface ClaimedMessage {
  id: number;
  to: string[];
  cc: string[];
  subject: string;
  text: string;
  html: string | null;
  attachments: { filename: string; contentType: string; content: string; contentId?: string }[];
  attempts: number;
}

/**
 * Claims up to `limit` due messages: marks them 'sending' and counts the attempt. `FOR UPDATE
 * SKIP LOCKED` lets several app instances on one PostgreSQL server claim side by side without
 * taking the same message (PostgreSQL docs, "The Locking Clause").
 */
async function claimDue(
  db: Database,
  now: Date,
  limit: number,
  skip: ReadonlySet<number>,
): Promise<ClaimedMessage[]> {
  // A pass tries each message once, even when a later `now` makes its retry due at once.
  const notTried = skip.size
    ? sql`and due.id not in (${sql.join(
        [...skip].map((id) => sql`${id}`),
        sql`, `,
      )})`
    : sql``;
  const result = await db.execute(sql`
    update outbox_messages as m
    set state = 'sending', attempts = m.attempts + 1, updated_at = now()
    where m.id in (
      select due.id from outbox_messages as due
      where ((due.state = 'queued' and due.next_attempt_at <= ${now.toISOString()}::timestamptz)
        or (due.state = 'sending'
          and due.updated_at < now() - make_interval(secs => ${abandonedAfterSeconds})))
      ${notTried}
      order by due.next_attempt_at, due.id
      limit ${limit}
      for update skip locked
    )
    returning m.id, m.to, m.cc, m.subject, m.text, m.html, m.attachments, m.attempts`);
  return rowsOf<ClaimedMessage>(result);
}

function errorText(error: unknown): string {
  if (error instanceof Error) {
    const code = (error as { code?: string }).code;
    return (code ? `${code}: ${error.message}` : error.message).slice(0, 2000);
  }
  return String(error).slice(0, 2000);
}

/**
 * Who mail is from: MAIL_FROM's address, under the district's sender name (its settings) when
 * it is set up, else MAIL_FROM as given.
 */
export async function senderOf(
  db: Database,
  configuredFrom: string,
): Promise<string | { name: string; address: string }> {
  const identity = await districtIdentity(db);
  if (!identity) return configuredFrom;
  const address = /<([^>]+)>\s*$/.exec(configuredFrom)?.[1] ?? configuredFrom.trim();
  return { name: identity.mailSenderName, address };
}

async function deliver(
  db: Database,
  transport: Transporter,
  from: string | { name: string; address: string },
  message: ClaimedMessage,
): Promise<boolean> {
  try {
    const info = await transport.sendMail({
      from,
      to: message.to,
      cc: message.cc.length ? message.cc : undefined,
      subject: message.subject,
      text: message.text,
      html: message.html ?? undefined,
      attachments: message.attachments.map((attachment) => ({
        filename: attachment.filename,
        contentType: attachment.contentType,
        content: Buffer.from(attachment.content, 'base64'),
        cid: attachment.contentId,
      })),
    });
    await db
      .update(outboxMessages)
      .set({
        state: 'sent',
        sentAt: new Date(),
        messageId: info.messageId ?? null,
        lastError: null,
        updatedAt: new Date(),
      })
      .where(eq(outboxMessages.id, message.id));
    return true;
  } catch (error) {
    const final = message.attempts >= maxAttempts;
    await db
      .update(outboxMessages)
      .set({
        state: final ? 'failed' : 'queued',
        lastError: errorText(error),
        nextAttemptAt: new Date(Date.now() + retryDelay(message.attempts)),
        updatedAt: new Date(),
      })
      .where(eq(outboxMessages.id, message.id));
    return false;
  }
}

/** What one pass over the outbox did. */
export interface DrainResult {
  sent: number;
  /** Tries that failed (the message is queued again, or failed after its last try). */
  failed: number;
}

async function drainWith(
  db: Database,
  transport: Transporter,
  configuredFrom: string,
  now: () => Date,
): Promise<DrainResult> {
  const result: DrainResult = { sent: 0, failed: 0 };
  const from = await senderOf(db, configuredFrom);
  const tried = new Set<number>();
  for (;;) {
    const claimed = await claimDue(db, now(), 10, tried);
    if (claimed.length === 0) return result;
    for (const message of claimed) {
      tried.add(message.id);
      if (await deliver(db, transport, from, message)) result.sent += 1;
      else result.failed += 1;
    }
  }
}

// Passes the in-process workers are running, per database, so that drainOutbox can wait for them.
const passesInFlight = new WeakMap<Database, Set<Promise<unknown>>>();

function track(db: Database, pass: Promise<unknown>): void {
  const passes = passesInFlight.get(db) ?? new Set();
  passesInFlight.set(db, passes);
  passes.add(pass);
  void pass.finally(() => passes.delete(pass)).catch(() => undefined);
}

async function settled(db: Database): Promise<void> {
  await Promise.allSettled([...(passesInFlight.get(db) ?? [])]);
}

/**
 * Sends every message due by `options.now` (default: now) once, and answers what happened.
 * Tests call it to make the worker run at once; pass a later `now` to take retries early.
 */
export async function drainOutbox(
  services: Pick<Services, 'db' | 'config'>,
  options: { now?: Date } = {},
): Promise<DrainResult> {
  const transport = createMailTransport(services.config.smtpUrl);
  try {
    // A worker's pass in progress finishes first, so the caller sees every message settled.
    await settled(services.db);
    const now = options.now;
    const result = await drainWith(
      services.db,
      transport,
      services.config.mailFrom,
      () => now ?? new Date(),
    );
    await settled(services.db);
    return result;
  } finally {
    transport.close();
  }
}

/** A running mail worker. */
export interface MailWorker {
  /** Stops polling and waits for the pass in progress. */
  stop(): Promise<void>;
}

/**
 * Starts the worker that sends queued mail: it polls every `pollMilliseconds` and runs soon
 * after a message is queued in this process.
 */
export function startMailWorker(
  services: Services,
  options: { pollMilliseconds?: number; nudgeDelayMilliseconds?: number } = {},
): MailWorker {
  const poll = options.pollMilliseconds ?? 2000;
  const nudgeDelay = options.nudgeDelayMilliseconds ?? 100;
  const transport = createMailTransport(services.config.smtpUrl);
  let stopped = false;
  let running: Promise<void> | undefined;
  let again = false;
  let timer: NodeJS.Timeout | undefined;

  const schedule = (delay: number) => {
    if (stopped) return;
    clearTimeout(timer);
    timer = setTimeout(run, delay);
    timer.unref();
  };
  const run = () => {
    if (stopped) return;
    if (running) {
      again = true;
      return;
    }
    const pass = drainWith(services.db, transport, services.config.mailFrom, () => new Date());
    track(services.db, pass);
    running = pass
      .then(() => undefined)
      .catch((error: unknown) => {
        if (!stopped)
          services.logger.warn({ err: error }, 'the mail worker could not read the outbox');
      })
      .finally(() => {
        running = undefined;
        schedule(again ? 0 : poll);
        again = false;
      });
  };
  const stopListening = onOutboxNudge(() => schedule(nudgeDelay));
  schedule(nudgeDelay);

  return {
    async stop() {
      stopped = true;
      clearTimeout(timer);
      stopListening();
      await running;
      transport.close();
    },
  };
}
