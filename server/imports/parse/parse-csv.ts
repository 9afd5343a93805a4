import Papa from 'papaparse';
import type { RowError } from './parsed-roster';

/** One record of a CSV file: the physical line it starts on and its cells by header. */
export interface CsvRecord {
  line: number;
  cells: Record<string, string>;
}

/** A CSV file split into headers and records, with what was wrong in its layout. */
export interface ParsedCsv {
  headers: string[];
  records: CsvRecord[];
  problems: RowError[];
  /** The delimiter the file was read with. */
  delimiter: string;
}

const lineFeed = 10;

/** The most columns a file may have: a roster export has a few dozen. */
export const mostColumns = 200;
/** The longest cell read, in characters; a longer one is reported and left out. */
export const longestCell = 10_000;

/**
 * How many cells the first line holds, for each candidate delimiter, counting no further than
 * `mostColumns + 1`: a hostile file of a million columns is refused after reading a few
 * hundred characters, before any parser walks the whole of it.
 */
function firstLineIsTooWide(text: string): number | undefined {
  const counts = new Map<string, number>([
    [',', 1],
    [';', 1],
    ['\t', 1],
  ]);
  let quoted = false;
  for (let index = 0; index < text.length; index++) {
    const character = text[index]!;
    if (character === '"') quoted = !quoted;
    else if (quoted) continue;
    else if (character === '\n' || character === '\r') {
      // Leading empty lines do not count as the first line.
      if ([...counts.values()].every((count) => count === 1) && text.slice(0, index).trim() === '')
        continue;
      return undefined;
    } else {
      const count = counts.get(character);
      if (count === undefined) continue;
      if (count + 1 > mostColumns) return count + 1;
      counts.set(character, count + 1);
    }
  }
  return undefined;
}

/** Counts physical line breaks: CRLF, a lone LF and a lone CR are one each (RFC 4180 uses CRLF). */
function lineBreaksIn(text: string): number {
  let count = 0;
  for (let index = text.indexOf('\n'); index !== -1; index = text.indexOf('\n', index + 1)) count++;
  for (let index = text.indexOf('\r'); index !== -1; index = text.indexOf('\r', index + 1)) {
    if (text.charCodeAt(index + 1) !== lineFeed) count++;
  }
  return count;
}

function embeddedLineBreaks(cells: string[]): number {
  let count = 0;
  for (const cell of cells) {
    if (cell.includes('\n') || cell.includes('\r')) count += lineBreaksIn(cell);
  }
  return count;
}

function headerNames(cells: string[], line: number, problems: RowError[]): string[] {
  const firstPlace = new Map<string, number>();
  return cells.map((cell, index) => {
    const header = cell.trim() || `Column ${index + 1}`;
    const first = firstPlace.get(header);
    if (first === undefined) {
      firstPlace.set(header, index);
    } else {
      problems.push({
        line,
        column: header,
        message: `Column '${header}' appears more than once (columns ${first + 1} and ${index + 1}); only the first is read.`,
      });
    }
    return header;
  });
}

function quoteProblem(error: Papa.ParseError): string {
  return error.code === 'MissingQuotes'
    ? 'A quoted cell is never closed: a double quote (") is missing, so the rest of the file was read into it.'
    : 'A quoted cell has text after its closing double quote (").';
}

// Papaparse's "greedy" rule: a line whose cells are all white space is an empty line.
function isEmptyLine(cells: string[]): boolean {
  return cells.every((cell) => cell.trim() === '');
}

/**
 * Splits CSV text into headers and records with papaparse: the delimiter is detected among
 * comma, semicolon and tab; CRLF, LF or CR line breaks; quoted fields may hold delimiters, double
 * quotes and line breaks (RFC 4180). Each record carries the physical line it starts on (the
 * header is line 1), which differs from its record number once a field holds a line break.
 * Fully empty lines are skipped, headers are trimmed, and a repeated header, cells beyond the
 * header and broken quoting are reported as problems. Never throws.
 */
export function parseCsv(text: string): ParsedCsv {
  const problems: RowError[] = [];
  const records: CsvRecord[] = [];
  const tooWide = firstLineIsTooWide(text);
  if (tooWide !== undefined) {
    problems.push({
      line: 1,
      column: '',
      message: `The header line has more than ${mostColumns} columns; a roster file has far fewer. Check that this is the right file, exported as CSV.`,
    });
    return { headers: [], records, problems, delimiter: ',' };
  }
  // Empty lines are kept while parsing so that every parsed line follows the one before it in
  // the text: a line starts one line break, plus those inside its quoted cells, after the last.
  // Papaparse guesses from the first ten lines; it must skip empty ones while guessing, or a
  // trailing line break counts against the true delimiter.
  const guess = Papa.parse<string[]>(text, {
    delimitersToGuess: [',', ';', '\t'],
    skipEmptyLines: 'greedy',
    preview: 10,
  });
  const parsed = Papa.parse<string[]>(text, { delimiter: guess.meta.delimiter });
  const quoteErrors = new Map<number, Papa.ParseError[]>();
  for (const error of parsed.errors) {
    if (error.type !== 'Quotes' || error.row === undefined) continue;
    quoteErrors.set(error.row, [...(quoteErrors.get(error.row) ?? []), error]);
  }
  let headers: string[] | undefined;
  let readable: { header: string; index: number }[] = [];
  let line = 1;
  parsed.data.forEach((cells, row) => {
    const lineOfRow = line;
    line += 1 + embeddedLineBreaks(cells);
    for (const error of quoteErrors.get(row) ?? []) {
      const place = Math.max(0, Math.min(cells.length, headers?.length ?? cells.length) - 1);
      problems.push({
        line: lineOfRow,
        column: headers?.[place] ?? '',
        message: quoteProblem(error),
      });
    }
    if (isEmptyLine(cells)) return;
    if (!headers) {
      headers = headerNames(cells, lineOfRow, problems);
      const seen = new Set<string>();
      readable = headers.flatMap((header, index) => {
        if (seen.has(header)) return [];
        seen.add(header);
        return [{ header, index }];
      });
      return;
    }
    const record: Record<string, string> = {};
    for (const { header, index } of readable) {
      const cell = cells[index] ?? '';
      if (cell.length > longestCell) {
        problems.push({
          line: lineOfRow,
          column: header,
          message: `This cell holds ${cell.length.toLocaleString('en-US')} characters, more than the ${longestCell.toLocaleString('en-US')} a cell may; it was not read.`,
        });
        record[header] = '';
      } else {
        record[header] = cell;
      }
    }
    if (cells.length > headers.length && !isEmptyLine(cells.slice(headers.length))) {
      problems.push({
        line: lineOfRow,
        column: `Column ${headers.length + 1}`,
        message: `This line has ${cells.length} cells but the header has ${headers.length}; the cells beyond column ${headers.length} were not read.`,
      });
    }
    records.push({ line: lineOfRow, cells: record });
  });
  return { headers: headers ?? [], records, problems, delimiter: parsed.meta.delimiter };
}
