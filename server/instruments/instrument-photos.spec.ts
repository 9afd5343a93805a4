import { describe, expect, it } from 'vitest';
import { imageTypeOf } from './instrument-photos';

describe('imageTypeOf', () => {
  it('should know JPEG, PNG and WebP by their first bytes', () => {
    // ITU-T T.81: SOI marker FF D8, then the next marker's FF.
    expect(imageTypeOf(Uint8Array.from([0xff, 0xd8, 0xff, 0xe0, 0, 0]))).toBe('image/jpeg');
    // PNG specification, "PNG signature": 89 50 4E 47 0D 0A 1A 0A.
    expect(imageTypeOf(Uint8Array.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a, 0]))).toBe(
      'image/png',
    );
    // RFC 9649: "RIFF", a four-byte size, then "WEBP".
    expect(imageTypeOf(new TextEncoder().encode('RIFF\u0000\u0000\u0000\u0000WEBPVP8 '))).toBe(
      'image/webp',
    );
  });

  it('should refuse text, SVG and a RIFF file that is not WebP', () => {
    expect(
      imageTypeOf(new TextEncoder().encode('<svg xmlns="http://www.w3.org/2000/svg"/>')),
    ).toBeNull();
    expect(
      imageTypeOf(new TextEncoder().encode('RIFF\u0000\u0000\u0000\u0000WAVEfmt ')),
    ).toBeNull();
    expect(imageTypeOf(new Uint8Array())).toBeNull();
  });
});
