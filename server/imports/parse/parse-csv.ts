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
const carriageReturn = 13;

/** Counts physical line breaks: CRLF, a lone LF and a lone CR are one each (RFC 4180 uses CRLF). */
function lineBreaksIn(text: string): number {
  let count = 0;
  for (let index = text.indexOf('\n'); index !== -1; index = text.indexOf('\n', index + 1)) count++;
  for (let index = text.indexOf('\r'); index !== -1; index = text.indexOf('\r', index + 1)) {
    if (text.charCodeAt(index + 1) !== lineFeed) count++;
  }
  return count;
}

/** Tells the line of a position in the text, for positions that only move forward. */
function lineCounter(text: string): (position: number) => number {
  let scanned = 0;
  let line = 1;
  return (position) => {
    for (; scanned < position; scanned++) {
      const code = text.charCodeAt(scanned);
      if (code === lineFeed) line++;
      else if (code === carriageReturn && text.charCodeAt(scanned + 1) !== lineFeed) line++;
    }
    return line;
  };
}

/**
 * Where a record's text ends, before the line break that closes it. A last cell that itself ends
 * in a line break, outside closing quotes, has swallowed that line break (broken quoting at the
 * end of the file).
 */
function contentEnd(text: string, cursor: number, cells: string[]): number {
  const last = text.charCodeAt(cursor - 1);
  let end = cursor;
  if (last === lineFeed)
    end = text.charCodeAt(cursor - 2) === carriageReturn ? cursor - 2 : cursor - 1;
  else if (last === carriageReturn) end = cursor - 1;
  const lastCell = cells[cells.length - 1] ?? '';
  const cellEndsInBreak = lastCell.endsWith('\n') || lastCell.endsWith('\r');
  return cellEndsInBreak && text[end - 1] !== '"' ? cursor : end;
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
  let headers: string[] | undefined;
  let readable: { header: string; index: number }[] = [];
  let delimiter = ',';
  const lineOf = lineCounter(text);
  Papa.parse<string[]>(text, {
    delimitersToGuess: [',', ';', '\t'],
    skipEmptyLines: 'greedy',
    step(step) {
      const cells = step.data;
      delimiter = step.meta.delimiter;
      const line = lineOf(contentEnd(text, step.meta.cursor, cells)) - embeddedLineBreaks(cells);
      for (const error of step.errors) {
        if (error.type !== 'Quotes') continue;
        const place = Math.max(0, Math.min(cells.length, headers?.length ?? cells.length) - 1);
        problems.push({ line, column: headers?.[place] ?? '', message: quoteProblem(error) });
      }
      if (!headers) {
        headers = headerNames(cells, line, problems);
        const seen = new Set<string>();
        readable = headers.flatMap((header, index) => {
          if (seen.has(header)) return [];
          seen.add(header);
          return [{ header, index }];
        });
        return;
      }
      const record: Record<string, string> = {};
      for (const { header, index } of readable) record[header] = cells[index] ?? '';
      if (
        cells.length > headers.length &&
        cells.slice(headers.length).some((cell) => cell.trim())
      ) {
        problems.push({
          line,
          column: `Column ${headers.length + 1}`,
          message: `This line has ${cells.length} cells but the header has ${headers.length}; the cells beyond column ${headers.length} were not read.`,
        });
      }
      records.push({ line, cells: record });
    },
  });
  return { headers: headers ?? [], records, problems, delimiter };
}
