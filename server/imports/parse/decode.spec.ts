import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { decodeText } from './decode';

const fixtures = new URL('../../../tests/fixtures/rosters/', import.meta.url);
const fixture = (name: string) => new Uint8Array(readFileSync(new URL(name, fixtures)));

describe('decodeText', () => {
  it('should read UTF-8 and drop the byte order mark when the bytes start with EF BB BF', () => {
    const bytes = new Uint8Array([0xef, 0xbb, 0xbf, ...new TextEncoder().encode('Zoë,Nguyễn')]);
    expect(decodeText(bytes)).toEqual({ text: 'Zoë,Nguyễn', encoding: 'utf-8' });
  });

  it('should read UTF-8 when the bytes are valid UTF-8 without a byte order mark', () => {
    expect(decodeText(new TextEncoder().encode('Muñoz'))).toEqual({
      text: 'Muñoz',
      encoding: 'utf-8',
    });
  });

  it('should read UTF-16LE and drop the byte order mark when the bytes start with FF FE', () => {
    const bytes = new Uint8Array([0xff, 0xfe, ...Buffer.from('Łukasiewicz\tK', 'utf16le')]);
    expect(decodeText(bytes)).toEqual({ text: 'Łukasiewicz\tK', encoding: 'utf-16le' });
  });

  // WHATWG Encoding Standard, index-windows-1252: 0xEB ë, 0xF1 ñ, 0x80 €, 0x9F Ÿ; the undefined
  // bytes 0x81, 0x8D, 0x8F, 0x90, 0x9D map to U+0081, U+008D, U+008F, U+0090, U+009D.
  it('should read Windows-1252 as WHATWG defines it when the bytes are not valid UTF-8', () => {
    const bytes = new Uint8Array([
      0x5a, 0x6f, 0xeb, 0x20, 0x4d, 0x75, 0xf1, 0x80, 0x9f, 0x81, 0x8d, 0x8f, 0x90, 0x9d,
    ]);
    expect(decodeText(bytes)).toEqual({
      text: 'Zoë Muñ€Ÿ\u0081\u008d\u008f\u0090\u009d',
      encoding: 'windows-1252',
    });
  });

  it('should give empty UTF-8 text when there are no bytes', () => {
    expect(decodeText(new Uint8Array())).toEqual({ text: '', encoding: 'utf-8' });
  });

  it.each([
    ['canonical-clean.csv', 'utf-8', 'Okonkwo-Reyes'],
    ['sis-export-windows1252-semicolon.csv', 'windows-1252', 'Zoë;Muñoz'],
    ['utf8-bom-quoted-linebreaks.csv', 'utf-8', 'Nguyễn'],
    ['spreadsheet-unicode-text-utf16le.txt', 'utf-16le', 'Łukasiewicz'],
  ])(
    'should detect the encoding of %s as %s when reading the fixture',
    (name, encoding, sample) => {
      const decoded = decodeText(fixture(name));
      expect(decoded.encoding).toBe(encoding);
      expect(decoded.text).toContain(sample);
      expect(decoded.text.startsWith('\uFEFF')).toBe(false);
    },
  );
});
