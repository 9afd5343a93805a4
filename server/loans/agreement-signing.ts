import { and, eq, isNull, sql } from 'drizzle-orm';
import type { Database } from '../db/client';
import { loans } from '../db/schema/index';
import { recordAudit } from '../core/audit';
import { findLoanByTokenHash, type LoanRow } from './loans-queries';
import { agreementFor, readAgreementText, sha256Hex } from './agreement-text';

/** What a signing link leads to. */
export type AgreementLookup =
  | { state: 'open'; row: LoanRow; text: string; textHash: string; textVersion: number }
  | { state: 'signed'; row: LoanRow }
  | { state: 'expired' | 'ended'; row: LoanRow }
  | { state: 'unknown' };

/** Finds the loan a one-time link belongs to and the exact text its guardian would sign. */
export async function openAgreement(
  db: Database,
  token: string,
  now = new Date(),
): Promise<AgreementLookup> {
  if (!/^[A-Za-z0-9_-]{20,100}$/.test(token)) return { state: 'unknown' };
  const row = await findLoanByTokenHash(db, sha256Hex(token));
  if (!row) return { state: 'unknown' };
  if (row.loan.signedAt) return { state: 'signed', row };
  if (!row.loan.agreementExpiresAt || row.loan.agreementExpiresAt <= now)
    return { state: 'expired', row };
  if (row.loan.state !== 'active') return { state: 'ended', row };
  const terms = await readAgreementText(db);
  const text = agreementFor(row, terms.text);
  return { state: 'open', row, text, textHash: sha256Hex(text), textVersion: terms.version };
}

/** What signing did. */
export type SigningOutcome =
  | { state: 'signed'; row: LoanRow; signedAt: Date; textHash: string }
  | { state: 'text-changed'; lookup: AgreementLookup & { state: 'open' } }
  | Exclude<AgreementLookup, { state: 'open' }>;

/**
 * Signs the agreement with the guardian's typed name, keeping the exact text and its SHA-256.
 * The link is then used up: the update only succeeds while the loan is still unsigned, so two
 * submissions of one link sign once. `shownHash` is the hash of the text the page showed; if the
 * coordinator changed the terms since, the guardian is shown the new text instead.
 */
export async function signAgreement(
  db: Database,
  token: string,
  signedName: string,
  shownHash: string,
  now = new Date(),
): Promise<SigningOutcome> {
  const lookup = await openAgreement(db, token, now);
  if (lookup.state !== 'open') return lookup;
  if (lookup.textHash !== shownHash) return { state: 'text-changed', lookup };
  const signed = await db.transaction(async (tx) => {
    const updated = await tx
      .update(loans)
      .set({
        signedName,
        signedAt: now,
        signedText: lookup.text,
        agreementTextHash: lookup.textHash,
        agreementTextVersion: lookup.textVersion,
        version: sql`${loans.version} + 1`,
        updatedAt: now,
      })
      .where(
        and(
          eq(loans.id, lookup.row.loan.id),
          isNull(loans.signedAt),
          eq(loans.agreementTokenHash, sha256Hex(token)),
        ),
      )
      .returning({ id: loans.id });
    if (updated.length === 0) return false;
    await recordAudit(tx, null, {
      action: 'sign',
      entity: 'loan',
      entityId: lookup.row.loan.id,
      after: { signedName, signedAt: now.toISOString(), agreementTextHash: lookup.textHash },
    });
    return true;
  });
  if (!signed) return { state: 'signed', row: lookup.row };
  return { state: 'signed', row: lookup.row, signedAt: now, textHash: lookup.textHash };
}
