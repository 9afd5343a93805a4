import { appendFileSync, existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import { dirname } from 'node:path';
import type { CaughtMessage, StoredMessage } from './caught-message.js';

interface StoreLine {
  message: CaughtMessage;
  attachmentContents: string[];
}

/**
 * The caught messages, in memory and, when a store file is given, appended to it as JSON lines
 * (one message with its attachments in base64 per line) so they survive a restart.
 */
export class MailboxStore {
  private readonly stored: StoredMessage[] = [];

  constructor(private readonly storeFile?: string) {
    if (storeFile && existsSync(storeFile)) {
      for (const line of readFileSync(storeFile, 'utf8').split('\n')) {
        if (line.trim()) {
          const { message, attachmentContents } = JSON.parse(line) as StoreLine;
          this.stored.push({
            message,
            attachmentContents: attachmentContents.map((content) => Buffer.from(content, 'base64')),
          });
        }
      }
    }
  }

  /** The id the next message gets. */
  nextId(): number {
    return this.stored.reduce((highest, { message }) => Math.max(highest, message.id), 0) + 1;
  }

  add(entry: StoredMessage): void {
    this.stored.push(entry);
    if (this.storeFile) {
      const line: StoreLine = {
        message: entry.message,
        attachmentContents: entry.attachmentContents.map((content) => content.toString('base64')),
      };
      mkdirSync(dirname(this.storeFile), { recursive: true });
      appendFileSync(this.storeFile, `${JSON.stringify(line)}\n`);
    }
  }

  /** Every message, newest first. */
  messages(): CaughtMessage[] {
    return this.stored.map(({ message }) => message).reverse();
  }

  message(id: number): CaughtMessage | undefined {
    return this.stored.find(({ message }) => message.id === id)?.message;
  }

  attachment(id: number, index: number): Buffer | undefined {
    return this.stored.find(({ message }) => message.id === id)?.attachmentContents[index];
  }

  clear(): void {
    this.stored.length = 0;
    if (this.storeFile && existsSync(this.storeFile)) {
      writeFileSync(this.storeFile, '');
    }
  }
}
