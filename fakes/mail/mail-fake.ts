import { createServer, type Server } from 'node:http';
import { listen } from '../listen.js';
import type { CaughtMessage } from './caught-message.js';
import { createMailboxApp } from './mailbox-http.js';
import { MailboxStore } from './mailbox-store.js';
import { createSmtpCatcher } from './smtp-catcher.js';

/** How to start the mail catcher. */
export interface MailFakeOptions {
  /** The SMTP port on 127.0.0.1; 0 picks a free one. Defaults to 2525. */
  smtpPort?: number;
  /** The mailbox page's port on 127.0.0.1; 0 picks a free one. Defaults to 4311. */
  httpPort?: number;
  /** A JSON lines file that keeps the messages, attachments included, across restarts. */
  storeFile?: string;
}

/** A running mail catcher. */
export interface MailFake {
  /** Where to send mail, such as `smtp://127.0.0.1:2525`. */
  smtpUrl: string;
  /** The mailbox page and JSON API, such as `http://127.0.0.1:4311`. */
  httpUrl: string;
  /** Every caught message, newest first. */
  messages(): CaughtMessage[];
  /** The bytes of attachment `index` (from 0) of message `id`. */
  attachment(id: number, index: number): Buffer | undefined;
  /** Deletes every message, from the store file too. */
  clear(): void;
  /** Stops both servers. */
  close(): Promise<void>;
}

function closeHttp(server: Server): Promise<void> {
  return new Promise((resolve, reject) => {
    server.close((error) => (error ? reject(error) : resolve()));
    server.closeAllConnections();
  });
}

/**
 * Starts an SMTP catcher on 127.0.0.1 that stands in for the district's mail relay, with a
 * mailbox page and a JSON API to read what arrived. Send to it with nodemailer's
 * `{ host, port, secure: false, ignoreTLS: true }`.
 */
export async function startMailFake(options: MailFakeOptions = {}): Promise<MailFake> {
  const store = new MailboxStore(options.storeFile);
  const smtp = createSmtpCatcher(store);
  const smtpPort = await listen(smtp.server, options.smtpPort ?? 2525);
  const smtpUrl = `smtp://127.0.0.1:${smtpPort}`;

  const http = createServer(createMailboxApp(store, () => smtpUrl));
  let httpPort: number;
  try {
    httpPort = await listen(http, options.httpPort ?? 4311);
  } catch (error) {
    await new Promise<void>((resolve) => smtp.close(() => resolve()));
    throw error;
  }

  return {
    smtpUrl,
    httpUrl: `http://127.0.0.1:${httpPort}`,
    messages: () => store.messages(),
    attachment: (id, index) => store.attachment(id, index),
    clear: () => store.clear(),
    close: async () => {
      await Promise.all([
        new Promise<void>((resolve) => smtp.close(() => resolve())),
        closeHttp(http),
      ]);
    },
  };
}
