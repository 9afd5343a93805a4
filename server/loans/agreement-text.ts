import { createHash, randomBytes } from 'node:crypto';
import type { Database } from '../db/client';
import type { AgreementText } from '@shared/api/loan';
import { readSetting, writeSetting } from '../core/settings';
import type { Actor } from '../core/policy';
import { recordAudit } from '../core/audit';
import { formatCents } from './money';
import { studentNameOf, type LoanRow } from './loans-queries';
import { instrumentNameOf } from '../instruments/instrument-cautions';

/** The app setting that holds the agreement text the coordinator maintains. */
export const agreementTextSetting = 'loan-agreement-text';

/** How long a guardian's signing link stays good. */
export const agreementLinkDays = 14;

/** The agreement guardians sign until the coordinator writes the district's own. */
export const defaultAgreementText = `By signing, I accept the loan of the district-owned instrument described above to my child, and agree that:

1. Care. My child keeps the instrument in its case when it is not being played, away from heat, damp and direct sun, and never leaves it in a vehicle. Only simple care (wiping it down, oiling valves, greasing slides, tuning strings) is done at home.

2. Repairs. Repairs beyond simple care go to a qualified repair technician arranged by the school. I will not have the instrument repaired elsewhere, and I will tell the director at once about any damage.

3. Usage fee. The usage fee shown above pays for the maintenance and repair of the district's fleet. A waiver may have been granted; it does not change any other part of this agreement.

4. Health. Mouthpieces and reeds are personal: my child uses their own and does not share them. A returned wind instrument is cleaned and sanitised before it is lent again, following the district's health guidance.

5. Heavy instruments. A heavy instrument (such as a tuba, euphonium, baritone saxophone or double bass) travels in its wheeled case and is carried by two people where needed, on stairs and into vehicles.

6. Return. The instrument, its case and accessories come back by the due date shown above, or earlier when the school asks or my child leaves the program. A lost or stolen instrument is reported to the director within two school days.

7. Loss or damage. Beyond normal wear, the family may be asked to share the cost of repairing or replacing an instrument that is lost or damaged through neglect, following the district's policy.`;

interface StoredText {
  text: string;
  version: number;
  updatedAt: string;
}

/** The agreement text in force, with its version (0 for the built-in default). */
export async function readAgreementText(db: Database): Promise<AgreementText> {
  const stored = await readSetting<StoredText>(db, agreementTextSetting);
  return stored
    ? { text: stored.text, version: stored.version, updatedAt: stored.updatedAt }
    : { text: defaultAgreementText, version: 0, updatedAt: null };
}

/** Replaces the agreement text; loans already signed keep the text they were signed with. */
export async function writeAgreementText(
  db: Database,
  actor: Actor,
  text: string,
): Promise<AgreementText> {
  const current = await readAgreementText(db);
  const next: StoredText = {
    text,
    version: current.version + 1,
    updatedAt: new Date().toISOString(),
  };
  await writeSetting(db, agreementTextSetting, next);
  await recordAudit(db, actor, {
    action: 'update',
    entity: 'loan-agreement-text',
    entityId: next.version,
    before: { version: current.version },
    after: { version: next.version },
  });
  return next;
}

/** SHA-256 of text, hex. */
export function sha256Hex(text: string): string {
  return createHash('sha256').update(text, 'utf8').digest('hex');
}

/** A fresh one-time signing token and what is stored of it: only its hash. */
export function newAgreementToken(now = new Date()): {
  token: string;
  tokenHash: string;
  expiresAt: Date;
} {
  const token = randomBytes(32).toString('base64url');
  return {
    token,
    tokenHash: sha256Hex(token),
    expiresAt: new Date(now.getTime() + agreementLinkDays * 24 * 60 * 60 * 1000),
  };
}

/** The particulars of one loan, as they head the agreement. */
export function loanParticulars(row: LoanRow): string {
  const { loan } = row;
  return [
    'Instrument loan agreement',
    `Instrument: ${instrumentNameOf(row.instrumentType)}, asset tag ${row.assetTag}`,
    `Student: ${studentNameOf(row)}, ${row.schoolName}`,
    `Lent on ${loan.checkedOutOn}, due back ${loan.dueOn}`,
    `Condition when lent: ${loan.conditionOut}`,
    `Accessories: ${loan.accessories.length ? loan.accessories.join(', ') : 'none'}`,
    `Usage fee: ${loan.waiver ? 'waived' : formatCents(loan.usageFeeCents)}`,
  ].join('\n');
}

/** The exact text a guardian signs for a loan: its particulars, then the district's terms. */
export function agreementFor(row: LoanRow, terms: string): string {
  return `${loanParticulars(row)}\n\n${terms}`;
}

/** Stores what a signing link needs on a loan; used at checkout and when a link is sent again. */
export function agreementLinkColumns(now = new Date()) {
  const { token, tokenHash, expiresAt } = newAgreementToken(now);
  return { token, columns: { agreementTokenHash: tokenHash, agreementExpiresAt: expiresAt } };
}
