import type { AddressObject, EmailAddress, ParsedMail } from 'mailparser';

/** A message the catcher received, as its JSON API returns it. */
export interface CaughtMessage {
  /** Increases by one with each message, across restarts when a store file is kept. */
  id: number;
  /** When the message arrived, as an ISO 8601 timestamp. */
  receivedAt: string;
  /** The From header as text (display name and address), or the envelope sender. */
  from: string;
  /** The To addresses, then any envelope recipient named in neither To nor Cc (a Bcc). */
  to: string[];
  cc: string[];
  subject: string;
  text: string;
  /** The HTML part, or null when the message has none. */
  html: string | null;
  attachments: { filename: string; contentType: string; size: number }[];
  messageId: string | null;
}

/** A caught message with the bytes of its attachments, in attachment order. */
export interface StoredMessage {
  message: CaughtMessage;
  attachmentContents: Buffer[];
}

/** The SMTP envelope of a delivery (RFC 5321 §2.3.1). */
export interface Envelope {
  mailFrom: string | undefined;
  recipients: string[];
}

function flattenAddresses(addresses: EmailAddress[]): string[] {
  return addresses.flatMap((address) =>
    address.group ? flattenAddresses(address.group) : address.address ? [address.address] : [],
  );
}

function addressesOf(field: AddressObject | AddressObject[] | undefined): string[] {
  const objects = field === undefined ? [] : Array.isArray(field) ? field : [field];
  return objects.flatMap((object) => flattenAddresses(object.value));
}

/** Turns a parsed message and its envelope into the catcher's record of it. */
export function toStoredMessage(
  id: number,
  parsed: ParsedMail,
  envelope: Envelope,
  receivedAt: Date,
): StoredMessage {
  const to = addressesOf(parsed.to);
  const cc = addressesOf(parsed.cc);
  const named = new Set([...to, ...cc].map((address) => address.toLowerCase()));
  const blindCopies = envelope.recipients.filter(
    (recipient) => !named.has(recipient.toLowerCase()),
  );
  return {
    message: {
      id,
      receivedAt: receivedAt.toISOString(),
      from: parsed.from?.text || envelope.mailFrom || '',
      to: [...to, ...blindCopies],
      cc,
      subject: parsed.subject ?? '',
      text: parsed.text ?? '',
      html: typeof parsed.html === 'string' ? parsed.html : null,
      attachments: parsed.attachments.map((attachment, index) => ({
        filename: attachment.filename ?? `attachment-${index + 1}`,
        contentType: attachment.contentType,
        size: attachment.content.length,
      })),
      messageId: parsed.messageId ?? null,
    },
    attachmentContents: parsed.attachments.map((attachment) => attachment.content),
  };
}
