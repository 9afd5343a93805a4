import { simpleParser } from 'mailparser';
import { SMTPServer } from 'smtp-server';
import { toStoredMessage } from './caught-message.js';
import type { MailboxStore } from './mailbox-store.js';

/** The largest message accepted, as announced by the SIZE extension (RFC 1870). */
export const maximumMessageBytes = 25 * 1024 * 1024;

/**
 * An SMTP server that accepts every message without authentication and keeps it in `store`.
 * STARTTLS is off: smtp-server's bundled certificate has expired, and the catcher only listens
 * on the loopback interface.
 */
export function createSmtpCatcher(store: MailboxStore): SMTPServer {
  return new SMTPServer({
    disabledCommands: ['STARTTLS'],
    authOptional: true,
    size: maximumMessageBytes,
    logger: false,
    closeTimeout: 1000,
    banner: 'Merrow Basin Unified local mail catcher',
    onData(stream, session, callback) {
      simpleParser(stream).then(
        (parsed) => {
          if (stream.sizeExceeded) {
            // RFC 1870 (SMTP SIZE extension): 552 for a message over the fixed maximum size.
            callback(
              Object.assign(new Error('Message exceeds the fixed maximum message size'), {
                responseCode: 552,
              }),
            );
            return;
          }
          const envelope = {
            mailFrom: session.envelope.mailFrom ? session.envelope.mailFrom.address : undefined,
            recipients: session.envelope.rcptTo.map((recipient) => recipient.address),
          };
          store.add(toStoredMessage(store.nextId(), parsed, envelope, new Date()));
          callback();
        },
        (error: Error) => callback(error),
      );
    },
  });
}
