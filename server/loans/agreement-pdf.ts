import type { Database } from '../db/client';
import type { Actor } from '../core/policy';
import { renderPdf } from '../instruments/pdf-document';
import { stateConflict } from '../instruments/instruments-service';
import { findLoanRow, studentNameOf } from './loans-queries';
import { districtIdentity } from '../district/district-queries';
import { pdfLetterhead } from '../district/district-print';

/** The signed agreement of a loan as a PDF: the exact text, who signed, when, and its SHA-256. */
export async function agreementPdf(db: Database, actor: Actor, id: number): Promise<Buffer> {
  const row = await findLoanRow(db, actor, id);
  const { loan } = row;
  if (!loan.signedAt || !loan.signedText) {
    throw stateConflict(
      'The guardian has not signed this agreement yet, so there is no signed copy.',
    );
  }
  return renderPdf({
    info: { title: `Loan agreement ${row.assetTag} ${studentNameOf(row)}`, creator: 'Tuttiboard' },
    pageSize: 'LETTER',
    pageMargins: [54, 54, 54, 54],
    content: [
      pdfLetterhead(await districtIdentity(db), 'instrument loan agreement'),
      {
        text: `Loan ${loan.id}: ${row.assetTag}, ${studentNameOf(row)}`,
        fontSize: 15,
        bold: true,
        margin: [0, 4, 0, 12],
      },
      { text: loan.signedText, lineHeight: 1.25 },
      {
        margin: [0, 18, 0, 0],
        table: {
          widths: [120, '*'],
          body: [
            ['Signed by', loan.signedName ?? ''],
            ['Signed at (UTC)', loan.signedAt.toISOString()],
            ['Agreement text version', String(loan.agreementTextVersion ?? 0)],
            ['SHA-256 of the text', { text: loan.agreementTextHash ?? '', fontSize: 8 }],
          ],
        },
        layout: 'lightHorizontalLines',
      },
      {
        text: 'The SHA-256 fingerprint is computed over the exact text above (UTF-8); any change to the text gives a different fingerprint.',
        fontSize: 8,
        color: '#555555',
        margin: [0, 10, 0, 0],
      },
    ],
  });
}
