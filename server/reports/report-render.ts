import type { ReportData } from '../../shared/api/report';
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
export function renderReport(data: ReportData): RenderedReport {
  return data.kind === 'director'
    ? { html: directorReportHtml(data), text: directorReportText(data), csvFiles: csvFilesOf(data) }
    : {
        html: districtReportHtml(data),
        text: districtReportText(data),
        csvFiles: csvFilesOf(data),
      };
}
