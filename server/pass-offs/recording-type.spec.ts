import { describe, expect, it } from 'vitest';
import { recordingTypeOf } from './recording-type';

const bytes = (...parts: (string | number[])[]) =>
  new Uint8Array(
    parts.flatMap((part) =>
      typeof part === 'string' ? [...part].map((character) => character.charCodeAt(0)) : part,
    ),
  );

describe('recordingTypeOf', () => {
  it('should recognise WebM when the EBML header names the webm DocType', () => {
    // EBML magic 1A 45 DF A3 and DocType element 42 82 (RFC 9559, Matroska).
    expect(
      recordingTypeOf(
        bytes([0x1a, 0x45, 0xdf, 0xa3, 0x9f, 0x42, 0x86, 0x81, 0x01, 0x42, 0x82, 0x84], 'webm'),
      ),
    ).toBe('audio/webm');
    expect(
      recordingTypeOf(bytes([0x1a, 0x45, 0xdf, 0xa3, 0x9f, 0x42, 0x82, 0x88], 'matroska')),
    ).toBeUndefined();
  });

  it('should recognise Ogg, WAVE and MP4 by their signatures', () => {
    // RFC 3533 section 6: capture pattern "OggS".
    expect(recordingTypeOf(bytes('OggS', [0, 2, 0, 0]))).toBe('audio/ogg');
    // RIFF chunk with form type WAVE (Multimedia Programming Interface and Data Specifications 1.0).
    expect(recordingTypeOf(bytes('RIFF', [0x24, 0, 0, 0], 'WAVEfmt '))).toBe('audio/wav');
    expect(recordingTypeOf(bytes('RIFF', [0x24, 0, 0, 0], 'AVI LIST'))).toBeUndefined();
    // ISO/IEC 14496-12: the file starts with an ftyp box.
    expect(recordingTypeOf(bytes([0, 0, 0, 0x20], 'ftypM4A ', [0, 0, 0, 0]))).toBe('audio/mp4');
  });

  it('should recognise MP3 by an ID3 tag or an MPEG audio frame sync', () => {
    // id3.org ID3v2.3.0 section 3.1: "ID3" then the version.
    expect(recordingTypeOf(bytes('ID3', [3, 0, 0]))).toBe('audio/mpeg');
    // ISO/IEC 11172-3: sync word of eleven 1 bits; FF FB is MPEG-1 Layer III.
    expect(recordingTypeOf(bytes([0xff, 0xfb, 0x90, 0x64]))).toBe('audio/mpeg');
    // Layer bits 00 are reserved, so FF E0 is not an audio frame.
    expect(recordingTypeOf(bytes([0xff, 0xe0, 0, 0]))).toBeUndefined();
  });

  it('should refuse text, images and empty files whatever their name says', () => {
    expect(
      recordingTypeOf(bytes('This is not audio, only a note renamed to .webm')),
    ).toBeUndefined();
    // PNG signature (ISO/IEC 15948 section 5.2).
    expect(recordingTypeOf(bytes([0x89], 'PNG', [0x0d, 0x0a, 0x1a, 0x0a]))).toBeUndefined();
    expect(recordingTypeOf(new Uint8Array())).toBeUndefined();
  });
});
