import type { Transaction } from '../db/client';
import { enqueueMail } from '../mail/outbox';
import { escapeHtml } from '@shared/html/escape-html';
import { instrumentNameOf } from '../instruments/instrument-cautions';
import { formatCents } from '../loans/money';
import { studentNameOf, type LoanRow } from '../loans/loans-queries';

function paragraphs(lines: string[]): string {
  return lines.map((line) => `<p>${escapeHtml(line)}</p>`).join('\n');
}

/** The receipt for a payment or a refund of a loan's usage fee; false when no guardian e-mail. */
export async function queueFeeReceipt(
  tx: Transaction,
  row: LoanRow,
  entry: {
    kind: 'payment' | 'refund';
    amountCents: number;
    reference: string | null;
    reason?: string | null;
    at: Date;
  },
): Promise<boolean> {
  if (!row.guardianEmail) return false;
  const what = `${instrumentNameOf(row.instrumentType)} (asset tag ${row.assetTag})`;
  const lines = [
    row.guardianName ? `Dear ${row.guardianName},` : 'Dear parent or guardian,',
    entry.kind === 'payment'
      ? `We received your payment of ${formatCents(entry.amountCents)} for the usage fee of the district ${what} lent to ${studentNameOf(row)} by ${row.schoolName}.`
      : `We refunded ${formatCents(entry.amountCents)} of the usage fee of the district ${what} lent to ${studentNameOf(row)} by ${row.schoolName}. It goes back to the card you paid with.`,
    ...(entry.kind === 'refund' && entry.reason ? [`Reason: ${entry.reason}`] : []),
    `Date: ${entry.at.toISOString().slice(0, 10)} · Loan ${row.loan.id}${entry.reference ? ` · Reference ${entry.reference}` : ''}`,
    'Keep this e-mail as your receipt. Questions go to the school’s music director.',
  ];
  await enqueueMail(tx, {
    kind: 'fee-receipt',
    to: [row.guardianEmail],
    subject:
      entry.kind === 'payment'
        ? `Receipt: instrument usage fee for ${studentNameOf(row)}`
        : `Refund: instrument usage fee for ${studentNameOf(row)}`,
    text: lines.join('\n\n'),
    html: paragraphs(lines),
    related: { type: 'loan', id: row.loan.id },
    schoolId: row.loan.schoolId,
  });
  return true;
}

/** A reminder that a loan's usage fee is unpaid, with the link to pay it. */
export async function queueFeeReminder(
  tx: Transaction,
  row: LoanRow,
  owedCents: number,
  payLink: string | undefined,
  createdBy: number,
): Promise<boolean> {
  if (!row.guardianEmail) return false;
  const what = `${instrumentNameOf(row.instrumentType)} (asset tag ${row.assetTag})`;
  const lines = [
    row.guardianName ? `Dear ${row.guardianName},` : 'Dear parent or guardian,',
    `The usage fee of ${formatCents(owedCents)} for the district ${what} lent to ${studentNameOf(row)} by ${row.schoolName} is still unpaid.`,
    payLink
      ? 'You can pay it online with a card on the payment service’s page (we never see the card number):'
      : 'Please pay it to the school’s music director.',
    ...(payLink ? [payLink] : []),
    'If your family may qualify for a waiver, ask the music director: a waived loan owes nothing.',
  ];
  await enqueueMail(tx, {
    kind: 'fee-reminder',
    to: [row.guardianEmail],
    subject: `Unpaid instrument usage fee for ${studentNameOf(row)}`,
    text: lines.join('\n\n'),
    html: payLink
      ? paragraphs(lines.slice(0, 3)) +
        `\n<p><a href="${escapeHtml(payLink)}">Pay the usage fee</a></p>\n` +
        paragraphs(lines.slice(4))
      : paragraphs(lines),
    related: { type: 'loan', id: row.loan.id },
    schoolId: row.loan.schoolId,
    createdBy,
  });
  return true;
}
