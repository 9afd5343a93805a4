import { createRequire } from 'node:module';

/** A pdfmake document definition (pdfmake 0.2 ships no types of its own). */
export type PdfDefinition = Record<string, unknown>;

interface PdfKitDocument {
  on(event: 'data', listener: (chunk: Buffer) => void): void;
  on(event: 'end', listener: () => void): void;
  on(event: 'error', listener: (error: Error) => void): void;
  end(): void;
}

type PdfPrinterConstructor = new (fonts: Record<string, Record<string, string>>) => {
  createPdfKitDocument(definition: PdfDefinition): PdfKitDocument;
};

const require = createRequire(import.meta.url);
let printer: InstanceType<PdfPrinterConstructor> | undefined;

/** pdfmake is loaded on the first PDF, not at start-up (it takes a fifth of a second to load). */
function pdfPrinter() {
  const PdfPrinter = require('pdfmake') as PdfPrinterConstructor;
  // PDF's standard Helvetica faces need no font files: nothing is read or downloaded.
  printer ??= new PdfPrinter({
    Helvetica: {
      normal: 'Helvetica',
      bold: 'Helvetica-Bold',
      italics: 'Helvetica-Oblique',
      bolditalics: 'Helvetica-BoldOblique',
    },
  });
  return printer;
}

/** Renders a pdfmake definition to PDF bytes in Helvetica. */
export function renderPdf(definition: PdfDefinition): Promise<Buffer> {
  const document = pdfPrinter().createPdfKitDocument({
    ...definition,
    defaultStyle: { font: 'Helvetica', fontSize: 10, ...(definition['defaultStyle'] as object) },
  });
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    document.on('data', (chunk) => chunks.push(chunk));
    document.on('end', () => resolve(Buffer.concat(chunks)));
    document.on('error', reject);
    document.end();
  });
}
