import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { decodeText } from './decode';
import { parseCsv } from './parse-csv';

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
  });

  it('should still read a header of exactly 200 columns, and commas inside quotes do not count', () => {
    const header = Array.from({ length: 200 }, (_, index) => `c${index}`).join(',');
    expect(parseCsv(`${header}\n${'1,'.repeat(199)}1\n`).headers).toHaveLength(200);
    const quoted = `"${','.repeat(500)}",b\n1,2\n`;
    expect(parseCsv(quoted).headers).toEqual([','.repeat(500), 'b']);
  });

  it('should leave out a cell longer than 10,000 characters and say so', () => {
    const csv = parseCsv(`a,b\n1,${'x'.repeat(10_001)}\n2,3\n`);
    expect(csv.records).toEqual([
      { line: 2, cells: { a: '1', b: '' } },
      { line: 3, cells: { a: '2', b: '3' } },
    ]);
    expect(csv.problems).toEqual([
      { line: 2, column: 'b', message: expect.stringMatching(/10,001 characters/) as string },
    ]);
  });
});
