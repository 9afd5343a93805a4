import QRCode from 'qrcode';
import { and, asc, eq } from 'drizzle-orm';
import type { Database } from '../db/client';
import { instruments, schools } from '../db/schema/index';
import { assertInScope, type Actor } from '../core/policy';
import { notFound } from '../core/errors';
import { instrumentScope } from './instruments-queries';
import { instrumentNameOf } from './instrument-cautions';
import { renderPdf } from './pdf-document';
import { districtIdentity } from '../district/district-queries';
import { pdfLogo } from '../district/district-print';

const labelsAcross = 3;
const labelLimit = 3000;

/** The instruments to label, in the caller's schools: one school's, one instrument, or all. */
function labelRows(
  db: Database,
  actor: Actor,
  schoolId: number | undefined,
  one: { instrumentId: number } | undefined,
) {
  return db
    .select({
      assetTag: instruments.assetTag,
      instrumentId: instruments.instrumentId,
      schoolCode: schools.code,
    })
    .from(instruments)
    .innerJoin(schools, eq(schools.id, instruments.homeSchoolId))
    .where(
      and(
        instrumentScope(actor),
        schoolId === undefined ? undefined : eq(instruments.homeSchoolId, schoolId),
        one === undefined ? undefined : eq(instruments.id, one.instrumentId),
      ),
    )
    .orderBy(asc(schools.code), asc(instruments.assetTag))
    .limit(labelLimit);
}

type LabelRow = Awaited<ReturnType<typeof labelRows>>[number];

/** What every label says of the owner: the district's short name, logo and a phone line. */
async function labelOwner(db: Database) {
  const district = await districtIdentity(db);
  const owner = district?.shortName ?? 'District';
  const contact = district?.contactLines.find(
    (line) => /\d/.test(line) && !line.includes('@') && line.length <= 24,
  );
  const logo = pdfLogo(district, 12, 60);
  return { owner, contact, logo };
}

/** One label: the tag's QR code beside the tag, the instrument and the owner. */
async function assetLabel(
  row: LabelRow,
  { owner, contact, logo }: Awaited<ReturnType<typeof labelOwner>>,
) {
  return {
    columns: [
      {
        image: await QRCode.toDataURL(row.assetTag, {
          errorCorrectionLevel: 'M',
          margin: 1,
          width: 180,
        }),
        fit: [58, 58],
        width: 62,
      },
      {
        stack: [
          { text: row.assetTag, bold: true, fontSize: 13 },
          { text: instrumentNameOf(row.instrumentId), fontSize: 9, margin: [0, 2, 0, 0] },
          ...(logo ? [{ ...logo, margin: [0, 3, 0, 0] }] : []),
          {
            text: `${row.schoolCode} · ${owner} property${contact ? ` · ${contact}` : ''}`,
            fontSize: 7,
            color: '#555555',
          },
        ],
        margin: [4, 6, 0, 0],
      },
    ],
    margin: [4, 4, 4, 4],
  };
}

/**
 * A printable sheet of asset-tag labels, three across, each with a QR code of the tag (so a
 * count can scan it), the tag in large type, the instrument and its home school.
 */
export async function assetLabelsPdf(
  db: Database,
  actor: Actor,
  schoolId?: number,
  one?: { instrumentId: number; skip: number },
): Promise<Buffer> {
  if (schoolId !== undefined) assertInScope(actor, schoolId, 'That school');
  const rows = await labelRows(db, actor, schoolId, one);
  if (one && rows.length === 0) throw notFound('That instrument');
  const labels: unknown[] = Array.from({ length: one?.skip ?? 0 }, () => ({ text: '' }));
  const owner = await labelOwner(db);
  const printed = await Promise.all(rows.map((row) => assetLabel(row, owner)));
  labels.push(...printed);
  const body: unknown[][] = [];
  // One label on a part-used sheet: the labels already peeled off (`skip`) are left blank, so
  // this one prints where the next free label is.
  for (let start = 0; start < labels.length; start += labelsAcross) {
    const line: unknown[] = labels.slice(start, start + labelsAcross);
    while (line.length < labelsAcross) line.push({ text: '' });
    body.push(line);
  }
  return renderPdf({
    info: { title: 'Asset-tag labels', creator: 'Tuttiboard' },
    pageSize: 'LETTER',
    pageMargins: [24, 30, 24, 30],
    content: body.length
      ? [
          {
            table: { widths: ['*', '*', '*'], body, dontBreakRows: true },
            layout: {
              hLineColor: () => '#bbbbbb',
              vLineColor: () => '#bbbbbb',
              hLineWidth: () => 0.5,
              vLineWidth: () => 0.5,
            },
          },
        ]
      : [{ text: 'No instruments to label.', italics: true }],
  });
}
