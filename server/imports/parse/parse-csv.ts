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
  /** Why the whole file was refused (a limit it goes past), when it was. */
  refusal?: string;
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

/**
 * Where a line of the file ends outside quotes, every {@link chunkCharacters} or so: the file is
 * parsed a piece at a time between these, so the event loop is let go between two pieces.
 */
const chunkCharacters = 256 * 1024;
/** How many times `what` occurs in the text between two places. */
function occurrences(text: string, what: string, from: number, to: number): number {
  let count = 0;
  for (let at = text.indexOf(what, from); at !== -1 && at < to; at = text.indexOf(what, at + 1))
    count++;
  return count;
}

/** How much of the start of the file papaparse guesses the delimiter and line break from. */
const guessCharacters = 64 * 1024;

/** Characters scanned between two looks at the clock. */
const scanStep = 64 * 1024;

/** What the layout scan found: where to cut the text, or why the file is refused. */
type Layout = { cuts: number[] } | { refusal: string };

const quote = 34;
const space = 32;

/**
 * Walks the text once, the way papaparse reads fields (a double quote opens a quoted field only
 * at the start of a field; inside one, `""` is a quote and a quote followed by spaces and then a
 * delimiter, a line break or the end closes it), counting the cells of each line and the
 * characters of each cell. Refuses the file at the first line of more than {@link mostColumns}
 * cells or the first cell of more than {@link longestCell} characters, before any parser builds
 * them; otherwise answers where to cut it. Yields every {@link scanStep} characters.
 */
function* scanLayout(text: string, delimiter: string, newline: string): Generator<void, Layout> {
  const delimiterCode = delimiter.charCodeAt(0);
  const newlineCode = newline.charCodeAt(0);
  const isNewline = (at: number) =>
    text.charCodeAt(at) === newlineCode && (newline.length === 1 || text.startsWith(newline, at));
  const cuts: number[] = [];
  let line = 1;
  let cells = 1;
  let cellStart = 0;
  let lastCut = 0;
  let index = 0;
  const tooLong = (end: number) =>
    end - cellStart > longestCell
      ? `Line ${line}, cell ${cells} holds ${(end - cellStart).toLocaleString('en-US')} characters; a cell may hold at most ${longestCell.toLocaleString('en-US')}. Check that this is the right file, exported as CSV.`
      : undefined;
  let nextYield = scanStep;
  while (index < text.length) {
    if (index >= nextYield) {
      yield;
      nextYield = index + scanStep;
    }
    if (index === cellStart && text.charCodeAt(index) === quote) {
      // A quoted field: find its closing quote.
      let at = index + 1;
      for (;;) {
        const next = text.indexOf('"', at);
        if (next === -1) return { cuts }; // Never closed: papaparse reads the rest into it.
        if (text.charCodeAt(next + 1) === quote) {
          at = next + 2;
          continue;
        }
        let after = next + 1;
        while (text.charCodeAt(after) === space) after++;
        if (after >= text.length || text.charCodeAt(after) === delimiterCode || isNewline(after)) {
          line += occurrences(text, newline, index, next);
          cellStart = index + 1;
          const refusal = tooLong(next);
          if (refusal) return { refusal };
          index = cellStart = after;
          break;
        }
        at = next + 1;
      }
      continue;
    }
    if (text.charCodeAt(index) === delimiterCode) {
      const refusal = tooLong(index);
      if (refusal) return { refusal };
      cells++;
      if (cells > mostColumns)
        return {
          refusal: `Line ${line} has more than ${mostColumns} columns; a roster file may have at most ${mostColumns}. Check that this is the right file, exported as CSV.`,
        };
      index++;
      cellStart = index;
    } else if (isNewline(index)) {
      const refusal = tooLong(index);
      if (refusal) return { refusal };
      if (index - lastCut >= chunkCharacters) {
        cuts.push(index);
        lastCut = index;
      }
      line++;
      cells = 1;
      index += newline.length;
      cellStart = index;
    } else index++;
  }
  const refusal = tooLong(text.length);
  return refusal ? { refusal } : { cuts };
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

/** What {@link parseCsv} is asked for beyond the defaults. */
export interface CsvOptions {
  /** Stop after this many records (a preview's first rows). */
  records?: number;
}

/**
 * Splits CSV text into headers and records with papaparse: the delimiter is detected among
 * comma, semicolon and tab; CRLF, LF or CR line breaks; quoted fields may hold delimiters, double
 * quotes and line breaks (RFC 4180). Each record carries the physical line it starts on (the
 * header is line 1), which differs from its record number once a field holds a line break.
 * Fully empty lines are skipped, headers are trimmed, and a repeated header, cells beyond the
 * header and broken quoting are reported as problems. A file with a line of more than
 * {@link mostColumns} cells or a cell of more than {@link longestCell} characters is refused
 * whole (`refusal`), found by one scan before papaparse builds a cell. Never throws.
 */
export function parseCsv(text: string, options: CsvOptions = {}): ParsedCsv {
  return runToEnd(csvSteps(text, options));
}

/**
 * {@link parseCsv} for the server: the text is scanned and parsed a piece at a time, and after
 * each `sliceMs` of work other requests run, so a large or hostile upload does not hold the
 * event loop while it is read.
 */
export async function parseCsvYielding(
  text: string,
  options: CsvOptions = {},
  sliceMs = 20,
): Promise<ParsedCsv> {
  return runYielding(csvSteps(text, options), sliceMs);
}

/** Runs a generator to its end at once and answers what it returns. */
export function runToEnd<Result>(steps: Generator<void, Result>): Result {
  for (;;) {
    const step = steps.next();
    if (step.done) return step.value;
  }
}

/** Runs a generator to its end, letting the event loop go after each `sliceMs` of work. */
export async function runYielding<Result>(
  steps: Generator<void, Result>,
  sliceMs: number,
): Promise<Result> {
  let sliceStart = performance.now();
  for (;;) {
    const step = steps.next();
    if (step.done) return step.value;
    if (performance.now() - sliceStart >= sliceMs) {
      await new Promise((resolve) => setImmediate(resolve));
      sliceStart = performance.now();
    }
  }
}

/** Reads the rows papaparse split into records, header first, keeping count of lines. */
class RecordReader {
  readonly problems: RowError[] = [];
  readonly records: CsvRecord[] = [];
  headers: string[] | undefined;
  private readable: { header: string; index: number }[] = [];
  private line = 1;

  add(cells: string[], quoteErrors: Papa.ParseError[]) {
    const lineOfRow = this.line;
    this.line += 1 + embeddedLineBreaks(cells);
    for (const error of quoteErrors) {
      const place = Math.max(0, Math.min(cells.length, this.headers?.length ?? cells.length) - 1);
      this.problems.push({
        line: lineOfRow,
        column: this.headers?.[place] ?? '',
        message: quoteProblem(error),
      });
    }
    if (isEmptyLine(cells)) return;
    if (!this.headers) {
      this.headers = headerNames(cells, lineOfRow, this.problems);
      const seen = new Set<string>();
      this.readable = this.headers.flatMap((header, index) => {
        if (seen.has(header)) return [];
        seen.add(header);
        return [{ header, index }];
      });
      return;
    }
    const record: Record<string, string> = {};
    for (const { header, index } of this.readable) record[header] = cells[index] ?? '';
    const headers = this.headers;
    if (cells.length > headers.length && !isEmptyLine(cells.slice(headers.length))) {
      this.problems.push({
        line: lineOfRow,
        column: `Column ${headers.length + 1}`,
        message: `This line has ${cells.length} cells but the header has ${headers.length}; the cells beyond column ${headers.length} were not read.`,
      });
    }
    this.records.push({ line: lineOfRow, cells: record });
  }
}

/** A file refused whole: its reason, also as the one problem of the upload as a whole. */
function refused(delimiter: string, refusal: string): ParsedCsv {
  const problems = [{ line: 0, column: '', message: refusal }];
  return { headers: [], records: [], problems, delimiter, refusal };
}

/** The steps of {@link parseCsv}: run by it at once, or with yields by the server. */
export function* csvSteps(text: string, options: CsvOptions): Generator<void, ParsedCsv> {
  // Papaparse guesses from the first ten lines; it must skip empty ones while guessing, or a
  // trailing line break counts against the true delimiter. A first line too wide is refused
  // before the guess parses it.
  const tooWide = firstLineIsTooWide(text);
  if (tooWide !== undefined) {
    return refused(
      ',',
      `The header line has more than ${mostColumns} columns; a roster file may have at most ${mostColumns}. Check that this is the right file, exported as CSV.`,
    );
  }
  // The guess reads the start of the file only: a line far wider than a roster's is refused by
  // the scan below, before papaparse splits it.
  const guess = Papa.parse<string[]>(text.slice(0, guessCharacters), {
    delimitersToGuess: [',', ';', '\t'],
    skipEmptyLines: 'greedy',
    preview: 10,
  });
  const delimiter = guess.meta.delimiter;
  const linebreak = guess.meta.linebreak as '\n' | '\r\n' | '\r';
  const layout = yield* scanLayout(text, delimiter, linebreak);
  if ('refusal' in layout) return refused(delimiter, layout.refusal);
  // Empty lines are kept while parsing so that every parsed line follows the one before it in
  // the text: a line starts one line break, plus those inside its quoted cells, after the last.
  const reader = new RecordReader();
  const ends = [...layout.cuts, text.length];
  let start = 0;
  for (const end of ends) {
    const parsed = Papa.parse<string[]>(text.slice(start, end), { delimiter, newline: linebreak });
    const quoteErrors = new Map<number, Papa.ParseError[]>();
    for (const error of parsed.errors) {
      if (error.type !== 'Quotes' || error.row === undefined) continue;
      quoteErrors.set(error.row, [...(quoteErrors.get(error.row) ?? []), error]);
    }
    for (const [row, cells] of parsed.data.entries()) {
      reader.add(cells, quoteErrors.get(row) ?? []);
      if (options.records !== undefined && reader.records.length >= options.records) break;
    }
    if (options.records !== undefined && reader.records.length >= options.records) break;
    start = end + linebreak.length;
    yield;
  }
  return {
    headers: reader.headers ?? [],
    records: reader.records,
    problems: reader.problems,
    delimiter,
  };
}
