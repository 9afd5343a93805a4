import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { toCsv } from './report-csv';

describe('toCsv', () => {
  it('should quote commas, quotes and line breaks and end lines with CRLF', () => {
    // RFC 4180 section 2: CRLF line breaks; fields with commas, quotes or breaks are quoted.
    expect(
      toCsv([
        ['name', 'note'],
        ['Brook, Ada', 'said "hi"\nthen left'],
      ]),
    ).toBe('name,note\r\n"Brook, Ada","said ""hi""\nthen left"\r\n');
  });

  it('should put a single quote before a cell that starts a formula', () => {
    // OWASP "CSV Injection": cells starting with = + - @ tab or carriage return.
    const csv = toCsv([['=SUM(A1)', '+1', '-2', '@cmd', '\tx', 'plain', 12]]);
    expect(Papa.parse<string[]>(csv.trim()).data[0]).toEqual([
      "'=SUM(A1)",
      "'+1",
      "'-2",
      "'@cmd",
      "'\tx",
      'plain',
      '12',
    ]);
  });
});
