import type { PdfDefinition } from '../instruments/pdf-document';
import { escapeHtml } from '@shared/html/escape-html';
import { logoAspect } from './district-logo';
import { logoPath, unnamedDistrict, type DistrictIdentity } from './district-queries';

/**
 * The district's logo as a pdfmake node, drawn `height` points high (narrower if it would be
 * wider than `maxWidth`); undefined when the district has none.
 */
export function pdfLogo(
  identity: DistrictIdentity | undefined,
  height: number,
  maxWidth: number,
): PdfDefinition | undefined {
  const logo = identity?.logo;
  if (!logo) return undefined;
  const type = logo.type as 'image/png' | 'image/svg+xml';
  const aspect = logoAspect({ type, bytes: logo.bytes });
  const width = Math.min(maxWidth, height * aspect);
  const size = { width, height: width / aspect };
  return type === 'image/png'
    ? {
        image: `data:image/png;base64,${logo.bytes.toString('base64')}`,
        fit: [size.width, size.height],
      }
    : { svg: logo.bytes.toString('utf8'), fit: [size.width, size.height] };
}

/** The heading of a district document: logo, name, the office's contact lines. */
export function pdfLetterhead(
  identity: DistrictIdentity | undefined,
  subject: string,
): PdfDefinition {
  const logo = pdfLogo(identity, 36, 140);
  const text = {
    stack: [
      {
        text: `${identity?.name ?? unnamedDistrict} · ${subject}`,
        color: '#8a5f10',
        bold: true,
        fontSize: 9,
      },
      ...(identity?.contactLines.length
        ? [
            {
              text: identity.contactLines.join(' · '),
              color: '#555555',
              fontSize: 8,
              margin: [0, 2, 0, 0],
            },
          ]
        : []),
    ],
    margin: [logo ? 8 : 0, logo ? 8 : 0, 0, 0],
  };
  return logo
    ? {
        columns: [
          { ...logo, width: 'auto' },
          { ...text, width: '*' },
        ],
      }
    : text;
}

/** The brand line of the server's own HTML pages: the logo (at most 40 px high) and the name. */
export function htmlBrand(identity: DistrictIdentity | undefined, subject: string): string {
  const logo = identity?.logo
    ? `<img class="logo" src="${logoPath}?v=${identity.logo.version}" alt="" style="max-height:40px;max-width:160px;vertical-align:middle;margin-right:.6rem">`
    : '';
  return `${logo}${escapeHtml(`${identity?.name ?? unnamedDistrict} · ${subject}`)}`;
}
