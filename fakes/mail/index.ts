export type { CaughtMessage } from './caught-message.js';
export { startMailFake, type MailFake, type MailFakeOptions } from './mail-fake.js';
