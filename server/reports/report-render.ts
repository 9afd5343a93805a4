import type { ReportData } from '@shared/api/report';
import { csvFilesOf, type ReportCsvFile } from './report-csv';
import { directorReportHtml, districtReportHtml } from './report-html';
import { directorReportText, districtReportText } from './report-text';

/** A report rendered once, for the preview, the e-mail and its attachments. */
export interface RenderedReport {
  html: string;
  text: string;
  csvFiles: ReportCsvFile[];
}

/** Renders a report's data as HTML (for mail clients and the preview), plain text and detail rows. */
export function renderReport(data: ReportData, district = ''): RenderedReport {
  const heading = district ? `${district}\n\n` : '';
  return data.kind === 'director'
    ? {
        html: directorReportHtml(data, district),
        text: heading + directorReportText(data),
        csvFiles: csvFilesOf(data),
      }
    : {
        html: districtReportHtml(data, district),
        text: heading + districtReportText(data),
        csvFiles: csvFilesOf(data),
      };
}

/** A file-name-safe form of the district's short name, to begin export file names with. */
export function fileNamePrefix(shortName: string | undefined): string {
  const slug = (shortName ?? '')
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .toLowerCase()
    .replace(/[^a-z0-9]+/g, '-')
    .replace(/^-+|-+$/g, '')
    .slice(0, 40);
  return slug ? `${slug}-` : '';
}
