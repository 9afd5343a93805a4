import type { Transaction } from '../db/client';
import { enqueueMail } from '../mail/outbox';
import { escapeHtml } from '@shared/html/escape-html';
import { cautionsFor, instrumentNameOf } from '../instruments/instrument-cautions';
import { studentNameOf, type LoanRow } from './loans-queries';
import { formatCents } from './money';

function paragraphs(lines: string[]): string {
  return lines.map((line) => `<p>${escapeHtml(line)}</p>`).join('\n');
}

/**
 * Queues the e-mail asking the guardian to read and sign the loan agreement through a one-time
 * link. Answers false (nothing queued) when the student has no guardian e-mail on file.
 */
export async function queueAgreementMail(
  tx: Transaction,
  row: LoanRow,
  link: string,
  expiresAt: Date,
  createdBy: number,
  /** The link to pay the usage fee online, when online payment is on and a fee is owed. */
  payLink?: string,
): Promise<boolean> {
  if (!row.guardianEmail) return false;
  const instrument = `${instrumentNameOf(row.instrumentType)} (asset tag ${row.assetTag})`;
  const greeting = row.guardianName ? `Dear ${row.guardianName},` : 'Dear parent or guardian,';
  const lines = [
    greeting,
    `${studentNameOf(row)} has been lent a district ${instrument} by ${row.schoolName}, due back on ${row.loan.dueOn}.`,
    'Please read the loan agreement and sign it by typing your name at this link. The link works once and until ' +
      `${expiresAt.toISOString().slice(0, 10)}:`,
    link,
    ...cautionsFor(row.instrumentType),
    ...(payLink
      ? [
          `The usage fee for this loan is ${formatCents(row.loan.usageFeeCents)}. Pay the usage fee online with a card (the payment service's page; we never see the card number):`,
          payLink,
        ]
      : []),
    'If you did not expect this message, tell the school’s music director.',
  ];
  const payIndex = payLink ? lines.indexOf(payLink) : -1;
  await enqueueMail(tx, {
    kind: 'loan-agreement',
    to: [row.guardianEmail],
    subject: `Please sign the instrument loan agreement for ${studentNameOf(row)}`,
    text: lines.join('\n\n'),
    html:
      paragraphs(lines.slice(0, 3)) +
      `\n<p><a href="${escapeHtml(link)}">Read and sign the agreement</a></p>\n` +
      (payIndex > 0
        ? paragraphs(lines.slice(4, payIndex)) +
          `\n<p><a href="${escapeHtml(payLink!)}">Pay the usage fee</a></p>\n` +
          paragraphs(lines.slice(payIndex + 1))
        : paragraphs(lines.slice(4))),
    related: { type: 'loan', id: row.loan.id },
    schoolId: row.loan.schoolId,
    createdBy,
  });
  return true;
}

/** Queues a reminder that a loan is due back (or overdue); false when there is no guardian e-mail. */
export async function queueReminderMail(
  tx: Transaction,
  row: LoanRow,
  overdue: boolean,
  createdBy: number | null,
): Promise<boolean> {
  if (!row.guardianEmail) return false;
  const instrument = `${instrumentNameOf(row.instrumentType)} (asset tag ${row.assetTag})`;
  const lines = [
    row.guardianName ? `Dear ${row.guardianName},` : 'Dear parent or guardian,',
    overdue
      ? `The district ${instrument} lent to ${studentNameOf(row)} was due back at ${row.schoolName} on ${row.loan.dueOn} and has not been returned.`
      : `The district ${instrument} lent to ${studentNameOf(row)} is due back at ${row.schoolName} on ${row.loan.dueOn}.`,
    'Please return it, with its case and accessories, to the music director, or reply to tell us when it will come back.',
    'Thank you for helping keep the district’s instruments available for every student.',
  ];
  await enqueueMail(tx, {
    kind: overdue ? 'overdue-reminder' : 'other',
    to: [row.guardianEmail],
    subject: overdue
      ? `Overdue: school instrument lent to ${studentNameOf(row)}`
      : `Reminder: school instrument lent to ${studentNameOf(row)} is due ${row.loan.dueOn}`,
    text: lines.join('\n\n'),
    html: paragraphs(lines),
    related: { type: 'loan', id: row.loan.id },
    schoolId: row.loan.schoolId,
    createdBy,
  });
  return true;
}
