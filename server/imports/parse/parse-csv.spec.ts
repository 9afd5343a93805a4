import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { decodeText } from './decode';
import Papa from 'papaparse';
import { parseCsv, parseCsvYielding } from './parse-csv';

const fixtures = new URL('../../../tests/fixtures/rosters/', import.meta.url);
const fixtureText = (name: string) => decodeText(readFileSync(new URL(name, fixtures))).text;

describe('parseCsv', () => {
  it.each([
    ['canonical-clean.csv', ','],
    ['sis-export-windows1252-semicolon.csv', ';'],
    ['tab-separated.tsv', '\t'],
    ['spreadsheet-unicode-text-utf16le.txt', '\t'],
  ])('should detect the delimiter of %s when reading the fixture', (name, delimiter) => {
    expect(parseCsv(fixtureText(name)).delimiter).toBe(delimiter);
  });

  it('should keep the comma when cells hold semicolons and the text ends with a line break', () => {
    const csv = parseCsv('a,b,c\r\nx;y;z;w,2,3\r\n');
    expect(csv.delimiter).toBe(',');
    expect(csv.records).toEqual([{ line: 2, cells: { a: 'x;y;z;w', b: '2', c: '3' } }]);
  });

  it('should give each record the physical line it starts on when quoted cells hold line breaks', () => {
    const csv = parseCsv(fixtureText('utf8-bom-quoted-linebreaks.csv'));
    expect(csv.records.map((record) => record.line)).toEqual([2, 5, 7]);
    expect(csv.records[0].cells['Home Address']).toBe('12 Alder Lane\r\nApt 3\r\nMerrow Basin');
    expect(csv.records[0].cells['Last Name']).toBe('Okafor, Jr.');
    expect(csv.records[1].cells['Preferred Name']).toBe('"Kit"');
    expect(csv.problems).toEqual([]);
  });

  it('should read LF, CRLF and CR line breaks alike when counting lines', () => {
    for (const lineBreak of ['\n', '\r\n', '\r']) {
      const csv = parseCsv(['a,b', '1,"x', 'y"', '', '2,3'].join(lineBreak));
      expect(csv.records).toEqual([
        { line: 2, cells: { a: '1', b: `x${lineBreak}y` } },
        { line: 5, cells: { a: '2', b: '3' } },
      ]);
    }
  });

  it('should skip empty lines and lines of bare delimiters when they come before or between records', () => {
    const csv = parseCsv('\n a , b \n\n1,2\n , \n3,4\n\n');
    expect(csv.headers).toEqual(['a', 'b']);
    expect(csv.records).toEqual([
      { line: 4, cells: { a: '1', b: '2' } },
      { line: 6, cells: { a: '3', b: '4' } },
    ]);
  });

  it('should report a repeated header and read only its first column when a header appears twice', () => {
    const csv = parseCsv('Grade,Name,Grade\n5,Ana,6\n');
    expect(csv.headers).toEqual(['Grade', 'Name', 'Grade']);
    expect(csv.records).toEqual([{ line: 2, cells: { Grade: '5', Name: 'Ana' } }]);
    expect(csv.problems).toEqual([
      {
        line: 1,
        column: 'Grade',
        message: "Column 'Grade' appears more than once (columns 1 and 3); only the first is read.",
      },
    ]);
  });

  it('should report cells beyond the header and fill missing cells with empty text when lines are ragged', () => {
    const csv = parseCsv('a,b\n1,2,3\n4\n5,6,,\n');
    expect(csv.records.map((record) => record.cells)).toEqual([
      { a: '1', b: '2' },
      { a: '4', b: '' },
      { a: '5', b: '6' },
    ]);
    expect(csv.problems).toEqual([
      {
        line: 2,
        column: 'Column 3',
        message:
          'This line has 3 cells but the header has 2; the cells beyond column 2 were not read.',
      },
    ]);
  });

  it('should name empty headers by their place when a header cell is blank', () => {
    expect(parseCsv('a,,c\n1,2,3').headers).toEqual(['a', 'Column 2', 'c']);
  });

  it('should report it on the line the cell starts when a quoted cell is never closed', () => {
    const csv = parseCsv('a,b\n1,2\n3,"open\n4,5\n');
    expect(csv.records.map((record) => record.line)).toEqual([2, 3]);
    expect(csv.problems).toEqual([
      {
        line: 3,
        column: 'b',
        message:
          'A quoted cell is never closed: a double quote (") is missing, so the rest of the file was read into it.',
      },
    ]);
  });

  it('should give no headers and no records when the text is empty', () => {
    expect(parseCsv('')).toEqual({ headers: [], records: [], problems: [], delimiter: ',' });
  });

  it('should refuse a header of more than 200 columns without reading the rest of the file', () => {
    const wide = Array.from({ length: 1_000_000 }, (_, index) => `c${index}`).join(',');
    const csv = parseCsv(`${wide}\n${wide}\n`);
    expect(csv.headers).toEqual([]);
    expect(csv.records).toEqual([]);
    expect(csv.problems).toHaveLength(1);
    expect(csv.problems[0]!.message).toMatch(/more than 200 columns/);
    expect(csv.refusal).toMatch(/at most 200/);
  });

  it('should still read a header of exactly 200 columns, and commas inside quotes do not count', () => {
    const header = Array.from({ length: 200 }, (_, index) => `c${index}`).join(',');
    expect(parseCsv(`${header}\n${'1,'.repeat(199)}1\n`).headers).toHaveLength(200);
    const quoted = `"${','.repeat(500)}",b\n1,2\n`;
    expect(parseCsv(quoted).headers).toEqual([','.repeat(500), 'b']);
  });

  it('should refuse the file when a cell is longer than 10,000 characters, naming the limit', () => {
    const csv = parseCsv(`a,b\n1,${'x'.repeat(10_001)}\n2,3\n`);
    expect(csv.records).toEqual([]);
    expect(csv.refusal).toMatch(
      /Line 2, cell 2 holds 10,001 characters; a cell may hold at most 10,000/,
    );
    expect(parseCsv(`a,b\n1,"${'x'.repeat(10_000)}"\n`).records).toHaveLength(1);
  });

  it('should refuse a line of more than 200 columns below a narrow header', () => {
    const csv = parseCsv(`a,b\n1,2\n${'1,'.repeat(1_000_000)}1\n`);
    expect(csv.records).toEqual([]);
    expect(csv.refusal).toMatch(/Line 3 has more than 200 columns/);
  });

  it('should read a file parsed a piece at a time as papaparse reads it whole', async () => {
    // Quoted cells with delimiters, doubled quotes and line breaks, over several pieces.
    const lines = ['id,name,note'];
    for (let index = 0; index < 30_000; index++)
      lines.push(
        index % 7 === 0
          ? `${index},"Name, ${index}","line one\r\nline ""two"" of ${index}"`
          : `${index},Name ${index},plain ${'n'.repeat(index % 50)}`,
      );
    const text = `${lines.join('\r\n')}\r\n`;
    expect(text.length).toBeGreaterThan(3 * 256 * 1024);
    // papaparse over the whole text, as the independent reading.
    const whole = Papa.parse<string[]>(text, { skipEmptyLines: true }).data;
    const csv = await parseCsvYielding(text, {}, 0);
    expect(csv.headers).toEqual(whole[0]);
    expect(csv.records.map((record) => Object.values(record.cells))).toEqual(whole.slice(1));
    expect(csv.records[7]!.line).toBe(10);
    expect(csv.records[8]!.line).toBe(12);
    expect(csv.problems).toEqual([]);
  });
});
