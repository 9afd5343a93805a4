import type { OutboxAttachmentInput } from '../mail/outbox';
import { toCsv, type ReportCsvFile } from './report-csv';

/** An Excel workbook of the report's detail rows, one sheet per table. */
export async function reportWorkbook(files: ReportCsvFile[]): Promise<Buffer> {
  // Loaded on first use: exceljs takes a third of a second to load, and start-up needs none of it.
  const { default: ExcelJS } = await import('exceljs');
  const workbook = new ExcelJS.Workbook();
  workbook.creator = 'Tuttiboard';
  for (const file of files) {
    // Excel limits a sheet name to 31 characters.
    const sheet = workbook.addWorksheet(file.name.slice(0, 31));
    // exceljs stores a string as a text cell (never a formula), so cells go in unchanged.
    sheet.addRows(file.rows);
    sheet.getRow(1).font = { bold: true };
    sheet.columns.forEach((column) => {
      column.width = 16;
    });
  }
  return Buffer.from(await workbook.xlsx.writeBuffer());
}

/** The report's attachments: a CSV file per table, and one workbook holding them all. */
export async function reportAttachments(
  baseName: string,
  files: ReportCsvFile[],
): Promise<OutboxAttachmentInput[]> {
  return [
    ...files.map((file) => ({
      filename: `${file.name}.csv`,
      contentType: 'text/csv; charset=utf-8',
      content: toCsv(file.rows),
    })),
    {
      filename: `${baseName}.xlsx`,
      contentType: 'application/vnd.openxmlformats-officedocument.spreadsheetml.sheet',
      content: await reportWorkbook(files),
    },
  ];
}
